import type { FloorUnitDto } from '@shared/schemas/lots'
import type { BomLineDto, CheckDto, WindingDto } from '@shared/schemas/recipes'

/** A numeric check, as the winding step of the demo recipe has them. */
export function numericCheck(overrides: Partial<CheckDto> = {}): CheckDto {
  return {
    id: 'c-la',
    stepId: 'step-1',
    position: 1,
    key: 'l_primary_a',
    label: 'Inductance, primary A',
    kind: 'numeric',
    unit: 'µH',
    nominal: 108,
    lower: 81,
    upper: 135,
    decimals: 1,
    choices: null,
    derived: null,
    derivedInputs: null,
    isKey: false,
    isForCustomers: true,
    ...overrides,
  }
}

export const secondary: WindingDto = {
  id: 'w-sec',
  position: 2,
  name: 'secondary',
  nominalTurns: 92,
  alNanoHenry: 3000,
  alTolerancePercent: 25,
  coreAreaMm2: null,
}

export function bomLine(overrides: Partial<BomLineDto> = {}): BomLineDto {
  return {
    id: '6f1c3c39-2d0e-4a57-9d0c-1f7f1c0e0a01',
    partId: 'part-core',
    partNumber: 'FCS-3000U',
    partDescription: 'Ferrite core set',
    unitOfMeasure: 'set',
    quantity: 1,
    refDesignators: '',
    fittedAtStepId: 'step-1',
    traceLevel: 'lot',
    ...overrides,
  }
}

/** What the Floor gets after scanning a unit queued at winding. */
export function floorUnit(
  checks: CheckDto[],
  bom: BomLineDto[] = [],
  windings: WindingDto[] = [secondary],
): FloorUnitDto {
  return {
    unit: {
      serial: 'FP24-2649-00017K',
      state: 'queued',
      currentStep: { id: 'step-1', name: 'Winding', stationKind: 'winding', position: 1 },
      reworkCount: 0,
      lotNumber: 'L-0042',
      productCode: 'FP24',
      productName: 'FP-24350',
      revisionLetter: 'B',
      holdReason: '',
    },
    refusal: null,
    step: {
      id: 'step-1',
      position: 1,
      name: 'Winding',
      stationKind: 'winding',
      instructions: 'Wind.\nMeasure.',
      safetyNote: '',
      requiresSignoff: false,
      checks,
    },
    bom,
    windings,
  }
}
