import type { CheckValue } from '../recipes/evaluate'
import type { CheckDto } from '../schemas/recipes'

/** What is wrong with a typed value for its check. */
export type TypedValueProblem =
  'missing' | 'not_number' | 'not_yes_no' | 'not_text' | 'not_a_choice'

type Typed = Pick<CheckDto, 'kind' | 'choices'>

/**
 * The one check of a typed value against its check's kind: present (blank text counts as
 * absent), a number, yes or no, text, or one of the choices. Null when the value may be judged;
 * whether it passes is judgeValue's business (shared/recipes/evaluate.ts). The scan, the bench
 * import and the Floor form all ask this.
 */
export function typedValueProblem(
  check: Typed,
  value: CheckValue | undefined,
): TypedValueProblem | null {
  if (value === undefined || value === null) return 'missing'
  if (typeof value === 'string' && value.trim() === '') return 'missing'
  switch (check.kind) {
    case 'numeric':
      return typeof value === 'number' && Number.isFinite(value) ? null : 'not_number'
    case 'boolean':
      return typeof value === 'boolean' ? null : 'not_yes_no'
    case 'text':
      return typeof value === 'string' ? null : 'not_text'
    case 'choice':
      if (typeof value !== 'string') return 'not_text'
      return check.choices?.some((o) => o.value === value) ? null : 'not_a_choice'
  }
}

const WORDS: Record<Exclude<TypedValueProblem, 'missing'>, string> = {
  not_number: 'must be a number',
  not_yes_no: 'must be yes or no',
  not_text: 'must be text',
  not_a_choice: 'not one of the choices',
}

/**
 * The problems of a step's typed values, keyed `values.<key>` in check order, in the words a
 * refused submission shows beside each field; empty when every value may be judged.
 */
export function typedValueFields(
  checks: readonly Pick<CheckDto, 'key' | 'label' | 'kind' | 'choices' | 'derived'>[],
  values: Readonly<Record<string, CheckValue>>,
): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const c of checks) {
    if (c.derived) continue
    const problem = typedValueProblem(c, values[c.key])
    if (problem)
      fields[`values.${c.key}`] = problem === 'missing' ? `enter ${c.label}` : WORDS[problem]
  }
  return fields
}
