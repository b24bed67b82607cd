/**
 * Units a check may use, with the factor to the SI base unit of their quantity. Derived
 * formulas convert through these, so an inductance typed in µH and one in mH compare alike.
 */
export const UNITS = {
  V: { quantity: 'voltage', toSi: 1 },
  mV: { quantity: 'voltage', toSi: 1e-3 },
  kV: { quantity: 'voltage', toSi: 1e3 },
  A: { quantity: 'current', toSi: 1 },
  mA: { quantity: 'current', toSi: 1e-3 },
  µA: { quantity: 'current', toSi: 1e-6 },
  W: { quantity: 'power', toSi: 1 },
  Ω: { quantity: 'resistance', toSi: 1 },
  mΩ: { quantity: 'resistance', toSi: 1e-3 },
  MΩ: { quantity: 'resistance', toSi: 1e6 },
  µH: { quantity: 'inductance', toSi: 1e-6 },
  mH: { quantity: 'inductance', toSi: 1e-3 },
  H: { quantity: 'inductance', toSi: 1 },
  Hz: { quantity: 'frequency', toSi: 1 },
  kHz: { quantity: 'frequency', toSi: 1e3 },
  s: { quantity: 'time', toSi: 1 },
  '%': { quantity: 'ratio', toSi: 0.01 },
  '°C': { quantity: 'temperature', toSi: 1 },
  turns: { quantity: 'count', toSi: 1 },
} as const

export type Unit = keyof typeof UNITS
export type Quantity = (typeof UNITS)[Unit]['quantity']
export const UNIT_SYMBOLS = Object.keys(UNITS) as Unit[]

/** The value in the SI base unit of its quantity (µH → H, mV → V, % → fraction). */
export function toSi(value: number, unit: Unit): number {
  return value * UNITS[unit].toSi
}

/** A value given in SI base units expressed in `unit`. */
export function fromSi(value: number, unit: Unit): number {
  return value / UNITS[unit].toSi
}
