import type { CheckKind, DerivedFormula } from './recipeDefinitions'

export interface CheckShape {
  kind: CheckKind
  unit: string | null
  nominal: number | null
  lower: number | null
  upper: number | null
  choices: { value: string; isPass: boolean }[] | null
  derived: DerivedFormula | null
}

/**
 * Problems with a check's limits and kind-specific fields, each naming its field. Used by the
 * zod schema on create and by the server on the merged record after a partial update.
 */
export function checkLimitProblems(c: CheckShape): { field: string; message: string }[] {
  const problems: { field: string; message: string }[] = []
  if (c.lower !== null && c.upper !== null && c.lower > c.upper)
    problems.push({ field: 'lower', message: 'the lower limit must not exceed the upper limit' })
  if (c.nominal !== null && c.lower !== null && c.nominal < c.lower)
    problems.push({ field: 'nominal', message: 'the nominal is below the lower limit' })
  if (c.nominal !== null && c.upper !== null && c.nominal > c.upper)
    problems.push({ field: 'nominal', message: 'the nominal is above the upper limit' })
  if (c.kind !== 'numeric' && (c.lower !== null || c.upper !== null || c.derived !== null))
    problems.push({
      field: 'kind',
      message: 'only numeric checks have limits or a derived formula',
    })
  if (c.kind === 'choice') {
    const choices = c.choices ?? []
    if (choices.length < 2)
      problems.push({ field: 'choices', message: 'give at least two choices' })
    else if (!choices.some((o) => o.isPass))
      problems.push({ field: 'choices', message: 'mark at least one choice as a pass' })
    else if (new Set(choices.map((o) => o.value)).size !== choices.length)
      problems.push({ field: 'choices', message: 'each choice must be different' })
  }
  return problems
}
