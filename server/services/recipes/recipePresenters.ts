import type {
  BomLineDto,
  CheckDto,
  RevisionDto,
  StepDto,
  WindingDto,
} from '../../../shared/schemas/recipes'
import type { BomLine, Check, Revision, RouteStep, Winding } from '../../models'

/** Model-to-JSON for the recipe records; the only place their DTO shapes are built. */
export function toWindingDto(w: Winding): WindingDto {
  return {
    id: w.id,
    position: w.position,
    name: w.name,
    nominalTurns: w.nominalTurns,
    alNanoHenry: w.alNanoHenry,
    alTolerancePercent: w.alTolerancePercent,
    coreAreaMm2: w.coreAreaMm2,
  }
}

export function toCheckDto(c: Check): CheckDto {
  return {
    id: c.id,
    stepId: c.stepId,
    position: c.position,
    key: c.key,
    label: c.label,
    kind: c.kind,
    unit: c.unit,
    nominal: c.nominal,
    lower: c.lower,
    upper: c.upper,
    decimals: c.decimals,
    choices: c.choices,
    derived: c.derived,
    derivedInputs: c.derivedInputs,
    isKey: c.isKey,
    isForCustomers: c.isForCustomers,
  }
}

export function toStepDto(s: RouteStep, checks: readonly Check[] = s.checks ?? []): StepDto {
  return {
    id: s.id,
    position: s.position,
    name: s.name,
    stationKind: s.stationKind,
    instructions: s.instructions,
    safetyNote: s.safetyNote,
    requiresSignoff: s.requiresSignoff,
    checks: [...checks].sort((a, b) => a.position - b.position).map(toCheckDto),
  }
}

export function toBomLineDto(b: BomLine): BomLineDto {
  return {
    id: b.id,
    partId: b.partId,
    partNumber: b.part?.partNumber ?? '',
    partDescription: b.part?.description ?? '',
    unitOfMeasure: b.part?.unitOfMeasure ?? 'pcs',
    quantity: b.quantity,
    refDesignators: b.refDesignators,
    fittedAtStepId: b.fittedAtStepId,
    traceLevel: b.traceLevel,
  }
}

/** A revision with everything under it, in position order; expects the full include. */
export function toRevisionDto(r: Revision): RevisionDto {
  return {
    id: r.id,
    letter: r.letter,
    status: r.status,
    productId: r.productId,
    productCode: r.product?.code ?? '',
    productName: r.product?.name ?? '',
    notes: r.notes,
    fpyThresholdPercent: r.fpyThresholdPercent,
    workingVolts: r.workingVolts,
    insulation: r.insulation,
    copiedFrom: r.copiedFrom ? { id: r.copiedFrom.id, letter: r.copiedFrom.letter } : null,
    releasedAt: r.releasedAt?.toISOString() ?? null,
    releasedBy: r.releaser?.name ?? null,
    createdAt: r.createdAt.toISOString(),
    windings: [...(r.windings ?? [])].sort((a, b) => a.position - b.position).map(toWindingDto),
    steps: [...(r.steps ?? [])].sort((a, b) => a.position - b.position).map((s) => toStepDto(s)),
    bom: [...(r.bomLines ?? [])].sort((a, b) => a.position - b.position).map(toBomLineDto),
  }
}
