import type { TurnRunDto, WindingTurnsDto } from '../../../shared/schemas/yield'

type SummaryInput = Pick<
  WindingTurnsDto,
  | 'name'
  | 'nominalTurns'
  | 'alTolerancePercent'
  | 'verdict'
  | 'suspects'
  | 'lotOffsetPercent'
  | 'byStation'
> & { runs: readonly TurnRunDto[] }

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`
const signed = (v: number, digits = 1) => `${v >= 0 ? '+' : '−'}${Math.abs(v).toFixed(digits)}`

/** Where the suspects were wound: each bench with its share of the suspects and of the runs. */
function benches(input: SummaryInput, suspects: readonly TurnRunDto[]): string {
  const counts = new Map<string, number>()
  for (const r of suspects) counts.set(r.stationCode, (counts.get(r.stationCode) ?? 0) + 1)
  return [...counts.entries()]
    .sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]))
    .map(([code, n]) => {
      const runs = input.byStation.find((g) => g.label === code)?.runs ?? n
      return `${code} (${n} of the ${plural(suspects.length, 'suspect')}, out of ${runs} wound there)`
    })
    .join(', ')
}

/** The ratio readings of the suspects, e.g. "94 turns" or "90–94 turns". */
function ratioReading(suspects: readonly TurnRunDto[]): string | null {
  const turns = suspects.flatMap((r) =>
    r.suspectBy.includes('ratio') && r.turnsFromRatio !== null
      ? [Math.round(r.turnsFromRatio)]
      : [],
  )
  if (!turns.length) return null
  const lo = Math.min(...turns)
  const hi = Math.max(...turns)
  return lo === hi ? `${lo} turns` : `${lo}–${hi} turns`
}

/**
 * The verdict of a winding's turn review in one or two sentences for the production lead:
 * which units look miscounted and at which bench, or whether a lot-wide inductance offset
 * points at the core lot instead. Pure; the same text goes on the board and in the lot report.
 */
export function turnSummary(input: SummaryInput): string {
  const n = input.nominalTurns
  if (input.verdict === 'no_data') return `No ${input.name} winding has been measured yet.`
  const parts: string[] = []
  if (input.verdict === 'miscount' || input.verdict === 'core_lot_and_miscount') {
    const suspects = input.runs.filter((r) => r.isSuspect)
    const reading = ratioReading(suspects)
    parts.push(
      `${plural(input.suspects, 'winding run')} of ${input.runs.length} look miscounted` +
        (reading ? `: the ratio test reads ${reading} where ${n} are specified` : '') +
        `. Wound at ${benches(input, suspects)}.`,
    )
  }
  if (input.verdict === 'core_lot' || input.verdict === 'core_lot_and_miscount') {
    parts.push(
      `The lot as a whole reads ${signed(input.lotOffsetPercent ?? 0)} % from the nominal inductance ` +
        `while its units agree with each other: that looks like the core lot (AL tolerance ` +
        `±${input.alTolerancePercent} %), not the winding.`,
    )
  }
  if (input.verdict === 'in_line')
    parts.push(
      `All ${plural(input.runs.length, 'run')} agree with the nominal ${n} turns and with the lot's own cores; no suspected miscount.`,
    )
  return parts.join(' ')
}
