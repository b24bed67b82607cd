import type { RevisionDto } from '../schemas/recipes'
import { UNITS } from '../units'
import type { Unit } from '../units'
import { DERIVED_FORMULAS } from '../recipeDefinitions'

/** One thing that stops a release, with the record it names so a screen can point at it. */
export interface ReleaseBlocker {
  message: string
  stepId: string | null
  checkId: string | null
  bomLineId: string | null
}

/**
 * What stops a revision from being released, in words an engineer can act on; empty when it is
 * complete. Derived checks may read only checks of their own step, which the Floor has at hand.
 */
export function releaseProblems(rev: Pick<RevisionDto, 'steps' | 'bom' | 'windings'>): string[] {
  return releaseBlockers(rev).map((b) => b.message)
}

/** The release problems of `releaseProblems`, each with the step, check or line it names. */
export function releaseBlockers(
  rev: Pick<RevisionDto, 'steps' | 'bom' | 'windings'>,
): ReleaseBlocker[] {
  const blockers: ReleaseBlocker[] = []
  const none = { stepId: null, checkId: null, bomLineId: null }
  if (rev.steps.length === 0) blockers.push({ message: 'the route has no steps', ...none })
  const stepIds = new Set(rev.steps.map((s) => s.id))
  for (const step of rev.steps) {
    const byKey = new Map(step.checks.map((c) => [c.key, c]))
    for (const c of step.checks) {
      const where = `step ${step.position} "${step.name}", check ${c.key}`
      const block = (message: string) =>
        blockers.push({ message, stepId: step.id, checkId: c.id, bomLineId: null })
      if (c.kind === 'numeric' && !c.unit) block(`${where}: choose a unit`)
      if (c.kind === 'numeric' && c.lower === null && c.upper === null)
        block(`${where}: give at least one limit`)
      if (!c.derived) continue
      const formula = DERIVED_FORMULAS[c.derived]
      if (c.unit && UNITS[c.unit as Unit].quantity !== formula.quantity)
        block(`${where}: the unit ${c.unit} does not fit ${formula.label.toLowerCase()}`)
      for (const input of formula.inputs) {
        const ref = c.derivedInputs?.[input.name]
        if (input.source === 'winding') {
          if (!rev.windings.some((w) => w.id === ref))
            block(`${where}: choose the winding for "${input.label}"`)
          continue
        }
        const source = ref ? byKey.get(ref) : undefined
        if (!source || source.derived)
          block(`${where}: choose a typed check of this step for "${input.label}"`)
        else if (!source.unit || UNITS[source.unit as Unit].quantity !== input.quantity)
          block(`${where}: "${input.label}" must be a ${input.quantity} check`)
      }
    }
  }
  for (const line of rev.bom) {
    if (!line.fittedAtStepId || !stepIds.has(line.fittedAtStepId))
      blockers.push({
        message: `bill of materials, ${line.partNumber}: choose the step where it is fitted`,
        ...none,
        bomLineId: line.id,
      })
  }
  return blockers
}
