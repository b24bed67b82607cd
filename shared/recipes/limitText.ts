import type { CheckDto } from '../schemas/recipes'

/** What limitText reads of a check, a trace value or an imported cell. */
export interface Limits {
  lower: number | null
  upper: number | null
  unit?: string | null
  /** Decimals the check records; a wording that needs none ignores it. */
  decimals?: number
  nominal?: number | null
}

/**
 * Where limits are read, each with its wording:
 * - `paper`: travelers and certificates ("81–135 µH (nom. 108)", "min 85 %", "exactly 6 turns");
 *   no ≤ or ≥, which the embedded PDF font lacks
 * - `trace`: the Trace screen and the unit history PDF ("19–32 mH", "max 5 mA", "—")
 * - `bench`: the Floor, read at arm's length ("81 – 135 µH", "= 6 turns", "≥ 85 %", "")
 * - `recipe`: the recipe editor, with the check's decimals shown ("11.40 to 12.60 µH")
 * - `import`: an imported row, numbers as the file had them ("0.5 to 1.5", "at least 85")
 */
export type LimitStyle = 'paper' | 'trace' | 'bench' | 'recipe' | 'import'

interface LimitWording {
  number(value: number, decimals: number): string
  between(lower: string, upper: string, hasNegative: boolean): string
  /** Prefix for equal limits; without one they are written as a range. */
  exactly?: string
  atLeast: string
  atMost: string
  /** Whether a nominal follows the limits, as " (nom. 108)". */
  hasNominal: boolean
  /** The words for a check without limits. */
  open(unit: string | null, nominal: string | null): string
}

/**
 * A limit as printed on paper: rounded to the check's decimals with trailing zeros dropped
 * ("85", not "85.00"), and a true minus sign so a faint photocopy does not lose it.
 */
export function limitNumber(value: number, decimals: number): string {
  return String(Number(value.toFixed(decimals))).replace('-', '−')
}

/** A number with at most `decimals` decimals and no padding zeros: 81, 9.9, 0.857. */
export function plainNumber(value: number, decimals: number): string {
  return new Intl.NumberFormat('en-GB', {
    maximumFractionDigits: decimals,
    useGrouping: false,
  }).format(value)
}

const nominalWords = (nominal: string | null) => (nominal === null ? '' : ` (nom. ${nominal})`)

const WORDINGS: Record<LimitStyle, LimitWording> = {
  paper: {
    number: limitNumber,
    // An en dash between two negative numbers reads as a third minus sign.
    between: (lower, upper, hasNegative) => `${lower}${hasNegative ? ' to ' : '–'}${upper}`,
    exactly: 'exactly ',
    atLeast: 'min ',
    atMost: 'max ',
    hasNominal: true,
    open: (unit, nominal) =>
      unit
        ? `record, in ${unit}${nominalWords(nominal)}`
        : `record the value${nominalWords(nominal)}`,
  },
  trace: {
    number: limitNumber,
    between: (lower, upper) => `${lower}–${upper}`,
    atLeast: 'min ',
    atMost: 'max ',
    hasNominal: false,
    open: (unit, nominal) => (nominal === null ? '—' : `nom. ${nominal}${unit ? ` ${unit}` : ''}`),
  },
  bench: {
    number: plainNumber,
    between: (lower, upper) => `${lower} – ${upper}`,
    exactly: '= ',
    atLeast: '≥ ',
    atMost: '≤ ',
    hasNominal: false,
    open: () => '',
  },
  recipe: {
    number: (value, decimals) => value.toFixed(decimals),
    between: (lower, upper) => `${lower} to ${upper}`,
    exactly: 'exactly ',
    atLeast: 'at least ',
    atMost: 'at most ',
    hasNominal: false,
    open: () => 'no limits',
  },
  import: {
    number: (value) => String(value),
    between: (lower, upper) => `${lower} to ${upper}`,
    atLeast: 'at least ',
    atMost: 'at most ',
    hasNominal: false,
    open: () => '',
  },
}

/**
 * A check's limits in the words of the place that shows them (see LimitStyle); the one function
 * behind screens and documents, so a wording changes in one table.
 * @param limits lower and upper (null when open), unit, decimals and nominal
 * @param style where the words appear
 */
export function limitText(limits: Limits, style: LimitStyle): string {
  const wording = WORDINGS[style]
  const decimals = limits.decimals ?? 0
  const n = (value: number) => wording.number(value, decimals)
  const unit = limits.unit ? ` ${limits.unit}` : ''
  const nominal = limits.nominal === null || limits.nominal === undefined ? null : n(limits.nominal)
  const after = `${unit}${wording.hasNominal ? nominalWords(nominal) : ''}`
  const { lower, upper } = limits
  if (lower !== null && upper !== null) {
    if (wording.exactly !== undefined && n(lower) === n(upper))
      return `${wording.exactly}${n(lower)}${unit}`
    return `${wording.between(n(lower), n(upper), lower < 0 || upper < 0)}${after}`
  }
  if (lower !== null) return `${wording.atLeast}${n(lower)}${after}`
  if (upper !== null) return `${wording.atMost}${n(upper)}${after}`
  return wording.open(limits.unit ?? null, nominal)
}

type Worded = Pick<
  CheckDto,
  'kind' | 'unit' | 'nominal' | 'lower' | 'upper' | 'decimals' | 'choices' | 'derived'
>

/**
 * What passes for a check, in the words printed on a traveler: "81–135 µH", "max 5 mA",
 * "min 85 %", "pass if: correct", "tick when done".
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
      return limitText(check, 'paper')
  }
}
