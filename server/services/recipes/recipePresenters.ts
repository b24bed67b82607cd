import type {
  BomLineDto,
  CheckDto,
  RevisionDto,
  StepDto,
  WindingDto,
} from '../../../shared/schemas/recipes'
import type { BomLine, Check, Revision, RouteStep, Winding } from '../../models'
import { partFields, pickFields } from '../presenters'

/** Model-to-JSON for the recipe records; the only place their DTO shapes are built. */
export function toWindingDto(w: Winding): WindingDto {
  return pickFields(w, [
    'id',
    'position',
    'name',
    'nominalTurns',
    'alNanoHenry',
    'alTolerancePercent',
    'coreAreaMm2',
  ])
}

export function toCheckDto(c: Check): CheckDto {
  return pickFields(c, [
    'id',
    'stepId',
    'position',
    'key',
    'label',
    'kind',
    'unit',
    'nominal',
    'lower',
    'upper',
    'decimals',
    'choices',
    'derived',
    'derivedInputs',
    'isKey',
    'isForCustomers',
  ])
}

export function toStepDto(s: RouteStep, checks: readonly Check[] = s.checks ?? []): StepDto {
  return {
    ...pickFields(s, [
      'id',
      'position',
      'name',
      'stationKind',
      'instructions',
      'safetyNote',
      'requiresSignoff',
    ]),
    checks: byPosition(checks).map(toCheckDto),
  }
}

export function toBomLineDto(b: BomLine): BomLineDto {
  return {
    ...pickFields(b, [
      'id',
      'partId',
      'quantity',
      'refDesignators',
      'fittedAtStepId',
      'traceLevel',
    ]),
    ...partFields(b.part),
  }
}

/** A revision with everything under it, in position order; expects the full include. */
export function toRevisionDto(r: Revision): RevisionDto {
  return {
    ...pickFields(r, [
      'id',
      'letter',
      'status',
      'productId',
      'notes',
      'fpyThresholdPercent',
      'workingVolts',
      'insulation',
    ]),
    productCode: r.product?.code ?? '',
    productName: r.product?.name ?? '',
    copiedFrom: r.copiedFrom ? { id: r.copiedFrom.id, letter: r.copiedFrom.letter } : null,
    releasedAt: r.releasedAt?.toISOString() ?? null,
    releasedBy: r.releaser?.name ?? null,
    createdAt: r.createdAt.toISOString(),
    windings: byPosition(r.windings ?? []).map(toWindingDto),
    steps: byPosition(r.steps ?? []).map((s) => toStepDto(s)),
    bom: byPosition(r.bomLines ?? []).map(toBomLineDto),
  }
}

/** A copy of recipe records in their `position` order. */
function byPosition<T extends { position: number }>(records: readonly T[]): T[] {
  return [...records].sort((a, b) => a.position - b.position)
}
