import { randomUUID } from 'node:crypto'
import type { Transaction } from 'sequelize'
import { BomLine, Check, RouteStep, Winding } from '../../models'
import type { Revision } from '../../models'
import { toCheckDto, toStepDto, toWindingDto } from './recipePresenters'

/**
 * Copies windings, steps, checks and bill-of-materials lines of `source` under `targetId` with
 * new ids, remapping every reference (derived-formula windings, fitted-at steps) to the copies.
 * The presenters list the copied fields, so a field added to a recipe record is copied too.
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
    (source.windings ?? []).map((w) => {
      const { id, ...fields } = toWindingDto(w)
      return { ...fields, id: newId(windingIds, id), revisionId: targetId }
    }),
    { transaction },
  )
  const steps = source.steps ?? []
  await RouteStep.bulkCreate(
    steps.map((s) => {
      const { id, checks: _checks, ...fields } = toStepDto(s, [])
      return { ...fields, id: newId(stepIds, id), revisionId: targetId }
    }),
    { transaction },
  )
  const remapInputs = (inputs: Record<string, string> | null) =>
    inputs &&
    Object.fromEntries(Object.entries(inputs).map(([k, v]) => [k, windingIds.get(v) ?? v]))
  await Check.bulkCreate(
    steps.flatMap((s) =>
      (s.checks ?? []).map((c) => {
        const { id: _id, stepId, derivedInputs, ...fields } = toCheckDto(c)
        return {
          ...fields,
          revisionId: targetId,
          stepId: stepIds.get(stepId)!,
          derivedInputs: remapInputs(derivedInputs),
        }
      }),
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
