// Shewhart chart constants for subgroups of 2–10, as printed in the NIST/SEMATECH e-Handbook of
// Statistical Methods §6.3.2. The rounded table values are used on purpose so that limits agree
// with hand calculations and the usual printed tables.

/** Constants for X-bar/R limits and for estimating σ from ranges (σ ≈ R̄ / d2). */
export interface ChartConstants {
  A2: number
  D3: number
  D4: number
  d2: number
}

// Index = subgroup size n.
const TABLE: Record<number, ChartConstants> = {
  2: { A2: 1.88, D3: 0, D4: 3.267, d2: 1.128 },
  3: { A2: 1.023, D3: 0, D4: 2.574, d2: 1.693 },
  4: { A2: 0.729, D3: 0, D4: 2.282, d2: 2.059 },
  5: { A2: 0.577, D3: 0, D4: 2.114, d2: 2.326 },
  6: { A2: 0.483, D3: 0, D4: 2.004, d2: 2.534 },
  7: { A2: 0.419, D3: 0.076, D4: 1.924, d2: 2.704 },
  8: { A2: 0.373, D3: 0.136, D4: 1.864, d2: 2.847 },
  9: { A2: 0.337, D3: 0.184, D4: 1.816, d2: 2.97 },
  10: { A2: 0.308, D3: 0.223, D4: 1.777, d2: 3.078 },
}

/** A2, D3, D4 and d2 for subgroup size n = 2–10; a RangeError for any other n. */
export function controlChartConstants(n: number): ChartConstants {
  const row = Number.isInteger(n) ? TABLE[n] : undefined
  if (!row) throw new RangeError('subgroup size must be a whole number from 2 to 10')
  return { ...row }
}
