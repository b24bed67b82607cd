import { limitNumber, limitText } from './recipes/limitText'
import type { TraceValueDto } from './schemas/trace'

/** A recorded value as a person reads it: "24.31 mH", "yes", the text itself. */
export function traceValueText(v: TraceValueDto): string {
  if (v.value === null) return '—'
  if (typeof v.value === 'boolean') return v.value ? 'yes' : 'no'
  if (typeof v.value === 'number')
    return `${limitNumber(v.value, v.decimals)}${v.unit ? ` ${v.unit}` : ''}`
  return v.value
}

/**
 * The limits a value was judged against, in words that survive a plain font: "19–32 mH",
 * "max 5 mA", "min 85 %" (no ≤/≥, which the embedded PDF font lacks), or "—" when none.
 */
export function traceLimitText(v: TraceValueDto): string {
  return v.kind === 'numeric' ? limitText(v, 'trace') : '—'
}
