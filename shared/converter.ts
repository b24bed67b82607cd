// Load-test arithmetic for a DC-DC converter, in volts and amperes.

function finite(name: string, v: number): void {
  if (!Number.isFinite(v)) throw new RangeError(`${name} must be a number`)
}

/** Efficiency as a fraction: P_out / P_in = (V_out·I_out) / (V_in·I_in). */
export function efficiency(input: {
  vin: number
  iin: number
  vout: number
  iout: number
}): number {
  for (const [k, v] of Object.entries(input)) finite(k, v)
  const pin = input.vin * input.iin
  if (pin <= 0) throw new RangeError('input power must be positive')
  return (input.vout * input.iout) / pin
}

/** Load regulation in % of the full-load voltage: 100 · (V_no-load − V_full-load) / V_full-load. */
export function loadRegulation(vNoLoad: number, vFullLoad: number): number {
  finite('no-load voltage', vNoLoad)
  finite('full-load voltage', vFullLoad)
  if (vFullLoad <= 0) throw new RangeError('full-load voltage must be positive')
  return (100 * (vNoLoad - vFullLoad)) / vFullLoad
}

/** Line regulation in %: 100 · (V_at-high-line − V_at-low-line) / V_nominal. */
export function lineRegulation(vAtLowLine: number, vAtHighLine: number, vNominal: number): number {
  finite('low-line voltage', vAtLowLine)
  finite('high-line voltage', vAtHighLine)
  if (!(vNominal > 0)) throw new RangeError('nominal voltage must be positive')
  return (100 * (vAtHighLine - vAtLowLine)) / vNominal
}

/** Output ripple (peak to peak) as % of the output voltage. */
export function ripplePercent(rippleVpp: number, vout: number): number {
  finite('ripple', rippleVpp)
  if (!(vout > 0)) throw new RangeError('output voltage must be positive')
  return (100 * rippleVpp) / vout
}
