import type { TraceValueDto } from './schemas/trace'

/** A number rounded to `decimals` with trailing zeros dropped and a true minus sign. */
export function shortNumber(value: number, decimals: number): string {
  return String(Number(value.toFixed(decimals))).replace('-', '−')
}

/** A recorded value as a person reads it: "24.31 mH", "yes", the text itself. */
export function traceValueText(v: TraceValueDto): string {
  if (v.value === null) return '—'
  if (typeof v.value === 'boolean') return v.value ? 'yes' : 'no'
  if (typeof v.value === 'number')
    return `${shortNumber(v.value, v.decimals)}${v.unit ? ` ${v.unit}` : ''}`
  return v.value
}

/**
 * The limits a value was judged against, in words that survive a plain font: "19–32 mH",
 * "max 5 mA", "min 85 %" (no ≤/≥, which the embedded PDF font lacks), or "—" when none.
 */
export function traceLimitText(v: TraceValueDto): string {
  const unit = v.unit ? ` ${v.unit}` : ''
  const n = (x: number) => shortNumber(x, v.decimals)
  if (v.kind !== 'numeric') return '—'
  if (v.lower !== null && v.upper !== null) return `${n(v.lower)}–${n(v.upper)}${unit}`
  if (v.upper !== null) return `max ${n(v.upper)}${unit}`
  if (v.lower !== null) return `min ${n(v.lower)}${unit}`
  return v.nominal !== null ? `nom. ${n(v.nominal)}${unit}` : '—'
}
