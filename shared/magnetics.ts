// Transformer winding arithmetic in SI units (henry, volt, hertz, tesla, m²); AL in nH/turn².

function positive(name: string, v: number): void {
  if (!Number.isFinite(v) || v <= 0) throw new RangeError(`${name} must be a positive number`)
}

/** Turns estimated from an inductance: L = AL·N², so N = √(L / AL), AL in nH/turn². */
export function turnsFromInductance(inductanceH: number, alNanoHenry: number): number {
  positive('inductance', inductanceH)
  positive('AL', alNanoHenry)
  return Math.sqrt(inductanceH / (alNanoHenry * 1e-9))
}

export interface TurnDeviation {
  estimatedTurns: number
  deviation: number
  deviationPercent: number
  /** The estimate rounds to another whole number of turns than the nominal. */
  miscount: boolean
}

/** Estimated turns from inductance minus the nominal turns, and whether that is a miscount. */
export function turnDeviation(input: {
  nominalTurns: number
  inductanceH: number
  alNanoHenry: number
}): TurnDeviation {
  positive('nominal turns', input.nominalTurns)
  const estimatedTurns = turnsFromInductance(input.inductanceH, input.alNanoHenry)
  const deviation = estimatedTurns - input.nominalTurns
  return {
    estimatedTurns,
    deviation,
    deviationPercent: (deviation / input.nominalTurns) * 100,
    miscount: Math.round(estimatedTurns) !== Math.round(input.nominalTurns),
  }
}

/** Secondary turns from a voltage-ratio test: N_s = N_p · V_s / V_p. */
export function secondaryTurnsFromRatio(
  primaryTurns: number,
  primaryVolts: number,
  secondaryVolts: number,
): number {
  positive('primary turns', primaryTurns)
  positive('primary voltage', primaryVolts)
  if (!Number.isFinite(secondaryVolts) || secondaryVolts < 0)
    throw new RangeError('secondary voltage must be 0 or more')
  return (primaryTurns * secondaryVolts) / primaryVolts
}

/**
 * Imbalance of the two halves of a centre-tapped winding, in % of their mean:
 * 100 · (L_A − L_B) / ((L_A + L_B) / 2). Zero for a perfectly matched pair.
 */
export function windingBalance(inductanceA: number, inductanceB: number): number {
  positive('inductance A', inductanceA)
  positive('inductance B', inductanceB)
  return (100 * (inductanceA - inductanceB)) / ((inductanceA + inductanceB) / 2)
}

/** Waveform factor k of Faraday's law: 4 for a square wave, 4.44 for a sine. */
export const WAVEFORM_FACTOR = { square: 4, sine: 4.44 } as const

/** Turns needed for a winding: N = V / (k · f · B_max · A_e). */
export function faradayTurns(input: {
  volts: number
  frequencyHz: number
  peakFluxT: number
  coreAreaM2: number
  waveform: 'square' | 'sine'
}): number {
  positive('voltage', input.volts)
  positive('frequency', input.frequencyHz)
  positive('peak flux density', input.peakFluxT)
  positive('core area', input.coreAreaM2)
  return (
    input.volts /
    (WAVEFORM_FACTOR[input.waveform] * input.frequencyHz * input.peakFluxT * input.coreAreaM2)
  )
}
