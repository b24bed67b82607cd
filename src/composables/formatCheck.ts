import { limitText } from '@shared/recipes/limitText'
import type { CheckDto } from '@shared/schemas/recipes'

type PassShape = Pick<CheckDto, 'lower' | 'upper' | 'unit' | 'decimals' | 'kind' | 'choices'>

/** A number with the check's decimals, or an em dash. */
export function formatValue(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  return value.toFixed(decimals)
}

/**
 * A typed number: accepts a decimal comma, as shop-floor keyboards in many countries type one.
 * @returns null for an empty or unreadable entry
 */
export function parseTypedNumber(text: string): number | null {
  const trimmed = text.trim().replace(',', '.')
  if (trimmed === '') return null
  const value = Number(trimmed)
  return Number.isFinite(value) ? value : null
}

/** When a check passes, to follow "Passes when": "81.0 to 135.0 µH", "answered yes", "Clean or Fine". */
export function describePass(check: PassShape): string {
  if (check.kind === 'numeric')
    return check.lower === null && check.upper === null
      ? 'any reading (no limits yet)'
      : limitText(check, 'recipe')
  if (check.kind === 'boolean') return 'answered yes'
  if (check.kind === 'text') return 'filled in'
  const passing = (check.choices ?? [])
    .filter((o) => o.isPass && o.value.trim())
    .map((o) => o.value)
  return passing.length ? passing.join(' or ') : 'no choice is marked as a pass'
}

/** "a voltage", "an inductance": the article for a word read aloud. */
export function withArticle(word: string): string {
  return `${/^[aeiou]/i.test(word) ? 'an' : 'a'} ${word}`
}
