import { randomUUID } from 'node:crypto'
import type { Transaction } from 'sequelize'
import { BomLine, Check, RouteStep, Winding } from '../models'
import type { Revision } from '../models'

/**
 * Copies windings, steps, checks and bill-of-materials lines of `source` under `targetId` with
 * new ids, remapping every reference (derived-formula windings, fitted-at steps) to the copies.
 */
export async function copyRecipe(
  source: Revision,
  targetId: string,
  transaction: Transaction,
): Promise<void> {
  const windingIds = new Map<string, string>()
  const stepIds = new Map<string, string>()
  const newId = (map: Map<string, string>, old: string) => {
    const id = randomUUID()
    map.set(old, id)
    return id
  }
  await Winding.bulkCreate(
    (source.windings ?? []).map((w) => ({
      id: newId(windingIds, w.id),
      revisionId: targetId,
      position: w.position,
      name: w.name,
      nominalTurns: w.nominalTurns,
      alNanoHenry: w.alNanoHenry,
      alTolerancePercent: w.alTolerancePercent,
      coreAreaMm2: w.coreAreaMm2,
    })),
    { transaction },
  )
  const steps = source.steps ?? []
  await RouteStep.bulkCreate(
    steps.map((s) => ({
      id: newId(stepIds, s.id),
      revisionId: targetId,
      position: s.position,
      name: s.name,
      stationKind: s.stationKind,
      instructions: s.instructions,
      safetyNote: s.safetyNote,
      requiresSignoff: s.requiresSignoff,
    })),
    { transaction },
  )
  const remapInputs = (inputs: Record<string, string> | null) =>
    inputs &&
    Object.fromEntries(Object.entries(inputs).map(([k, v]) => [k, windingIds.get(v) ?? v]))
  await Check.bulkCreate(
    steps.flatMap((s) =>
      (s.checks ?? []).map((c) => ({
        revisionId: targetId,
        stepId: stepIds.get(s.id)!,
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
        derivedInputs: remapInputs(c.derivedInputs),
      })),
    ),
    { transaction },
  )
  await BomLine.bulkCreate(
    (source.bomLines ?? []).map((b) => ({
      revisionId: targetId,
      partId: b.partId,
      quantity: b.quantity,
      refDesignators: b.refDesignators,
      fittedAtStepId: b.fittedAtStepId ? (stepIds.get(b.fittedAtStepId) ?? null) : null,
      traceLevel: b.traceLevel,
      position: b.position,
    })),
    { transaction },
  )
}
