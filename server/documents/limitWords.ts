import type { CheckDto } from '../../shared/schemas/recipes'

type Worded = Pick<
  CheckDto,
  'kind' | 'unit' | 'nominal' | 'lower' | 'upper' | 'decimals' | 'choices' | 'derived'
>

/**
 * A limit as printed on paper: rounded to the check's decimals with trailing zeros dropped
 * ("85", not "85.00"), and a true minus sign so a faint photocopy does not lose it.
 */
export function limitNumber(value: number, decimals: number): string {
  return String(Number(value.toFixed(decimals))).replace('-', '−')
}

/**
 * What passes for a check, in the words printed on a traveler: "81–135 µH", "max 5 mA",
 * "min 85 %", "pass if: correct", "tick when done". The ≤ and ≥ signs are not used because the
 * embedded Latin font has no glyph for them; "min" and "max" read as fast on the floor.
 */
export function checkLimitWords(check: Worded): string {
  switch (check.kind) {
    case 'boolean':
      return 'tick when done'
    case 'text':
      return 'write it in'
    case 'choice': {
      const passing = (check.choices ?? []).filter((c) => c.isPass).map((c) => c.value)
      return passing.length ? `pass if: ${passing.join(' or ')}` : 'choose one'
    }
    case 'numeric':
      return numericWords(check)
  }
}

function numericWords(check: Worded): string {
  const unit = check.unit ? ` ${check.unit}` : ''
  const n = (v: number) => limitNumber(v, check.decimals)
  const nominal = check.nominal === null ? '' : ` (nom. ${n(check.nominal)})`
  const { lower, upper } = check
  if (lower !== null && upper !== null) {
    if (n(lower) === n(upper)) return `exactly ${n(lower)}${unit}`
    // An en dash between two negative numbers reads as a third minus sign.
    const joint = lower < 0 || upper < 0 ? ' to ' : '–'
    return `${n(lower)}${joint}${n(upper)}${unit}${nominal}`
  }
  if (lower !== null) return `min ${n(lower)}${unit}${nominal}`
  if (upper !== null) return `max ${n(upper)}${unit}${nominal}`
  return check.unit ? `record, in ${check.unit}${nominal}` : `record the value${nominal}`
}
