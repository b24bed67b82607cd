/**
 * A starting point for the dielectric withstand (hipot) test voltage: 2·U + 1000 V AC for basic
 * insulation, twice that for reinforced, and the DC equivalent ×√2. Common practice only: the
 * product safety standard that applies decides the real value, duration and limits.
 */
export function suggestedHipotVolts(
  workingVolts: number,
  insulation: 'basic' | 'reinforced',
): { ac: number; dc: number } {
  if (!Number.isFinite(workingVolts) || workingVolts <= 0)
    throw new RangeError('working voltage must be positive')
  const basic = 2 * workingVolts + 1000
  const ac = insulation === 'reinforced' ? 2 * basic : basic
  return { ac, dc: ac * Math.SQRT2 }
}

/** The caution shown on hipot and load-test steps and documents (DESIGN.md §8). */
export const HIGH_VOLTAGE_CAUTION =
  'High voltage: test only in the interlocked fixture, discharge the unit before handling it, and let trained operators alone run this step. The applicable safety standard, local codes and licensed practice govern; Waymark records results and does not certify a design.'
