// Quality alerts: a lot's step below its first-pass-yield threshold, or a check's values in
// build order out of control by the Western Electric run rules, as one episode (episodes.ts).
// Pure: the alerts worker feeds in the figures it read; the e-mail and the UI word them here,
// plain words first (what happened, where, what to look at), the statistics after.
import type { StationKind } from '../stations'
import { UNITS } from '../units'
import type { Unit } from '../units'
import { wilsonInterval, type ProportionInterval } from './proportion'
import type { EpisodePoint } from './episodes'

export { RUN_RULE_MIN_POINTS, NOT_ENOUGH_VARIATION } from './episodes'

/** What tripped an alert. The run rules are Western Electric rules 1–4 (see `runRules.ts`). */
export const ALERT_RULES = [
  'fpy_below_threshold',
  'run_rule_1',
  'run_rule_2',
  'run_rule_3',
  'run_rule_4',
] as const
export type AlertRule = (typeof ALERT_RULES)[number]

/** Where an alert stands: waiting for a lead, or seen and acknowledged by one. */
export const ALERT_STATUSES = ['open', 'acknowledged'] as const
export type AlertStatus = (typeof ALERT_STATUSES)[number]

/** A step's FPY is judged only once this many units have made a first attempt there. */
export const FPY_MIN_FIRST_ATTEMPTS = 10

/** The figures behind an FPY alert, as stored in `alerts.details`. */
export interface FpyAlertDetails {
  kind: 'fpy'
  passedFirst: number
  firstAttempts: number
  fpy: number
  thresholdPercent: number
  /** 95 % Wilson interval of the step FPY. */
  interval: ProportionInterval
  /** The station every failed first attempt was made at, or null when they differ. */
  station?: string | null
  /** What to look at first, in words. */
  hint?: string
}

/** The figures behind a run-rule episode, as stored in `alerts.details`. */
export interface RunRuleAlertDetails {
  kind: 'run_rule'
  /** Every rule broken in the episode, ascending. */
  rules: (1 | 2 | 3 | 4)[]
  /** The check's nominal, or the median of the lot's values (the mean in alerts before episodes). */
  centre: number
  centreSource: 'nominal' | 'lot_median' | 'lot_mean'
  /** Within sigma: average moving range of the lot's values in build order / d2 (1.128). */
  sigma: number
  /** How many values the chart had when the episode was last judged. */
  points: number
  /** 0-based build-order index of the episode's first and latest broken rule. */
  start: number
  last: number
  /** The unit at the episode's first broken rule. */
  serial: string
  /** Which side of the centre the episode's points fall, and how far on average. */
  side: 'above' | 'below'
  shift: number
  /** Points of the window beyond the episode's zone on its side. */
  outCount: number
  /** The last points up to the latest broken rule, oldest first. */
  window: EpisodePoint[]
  /** The station and operator those points share, or null when they differ. */
  station: string | null
  operator: string | null
  /** What to look at first, in words. */
  hint: string
}

export type AlertDetails = FpyAlertDetails | RunRuleAlertDetails

/**
 * The FPY alert for a step, or null: the step must have at least `FPY_MIN_FIRST_ATTEMPTS` first
 * attempts and its FPY must be strictly below the threshold (90 % of 10 is not below 90 %).
 */
export function fpyBreach(input: {
  passedFirst: number
  firstAttempts: number
  thresholdPercent: number
}): FpyAlertDetails | null {
  const { passedFirst, firstAttempts, thresholdPercent } = input
  if (!Number.isInteger(passedFirst) || !Number.isInteger(firstAttempts))
    throw new RangeError('counts must be whole numbers')
  if (passedFirst < 0 || passedFirst > firstAttempts)
    throw new RangeError('passes must be between 0 and the first attempts')
  if (!(thresholdPercent >= 0 && thresholdPercent <= 100))
    throw new RangeError('the threshold must be 0 to 100 %')
  if (firstAttempts < FPY_MIN_FIRST_ATTEMPTS) return null
  // Compare in whole numbers where possible: 9/10 against 90 % must not be "below" by rounding.
  if (passedFirst * 100 >= thresholdPercent * firstAttempts) return null
  return {
    kind: 'fpy',
    passedFirst,
    firstAttempts,
    fpy: passedFirst / firstAttempts,
    thresholdPercent,
    interval: wilsonInterval(passedFirst, firstAttempts),
  }
}

/** The alert rule a run-rule number is stored as. */
export function runRuleName(rule: 1 | 2 | 3 | 4): AlertRule {
  return `run_rule_${rule}`
}

const RULE_LABELS: Record<AlertRule, string> = {
  fpy_below_threshold: 'Low FPY',
  run_rule_1: 'Run rule 1',
  run_rule_2: 'Run rule 2',
  run_rule_3: 'Run rule 3',
  run_rule_4: 'Run rule 4',
}

const RULE_WORDS: Record<AlertRule, string> = {
  fpy_below_threshold: "first-pass yield below the revision's threshold",
  run_rule_1: 'a point more than 3σ from the centre',
  run_rule_2: '2 of 3 points in a row beyond 2σ on one side',
  run_rule_3: '4 of 5 points in a row beyond 1σ on one side',
  run_rule_4: '8 points in a row on one side of the centre',
}

/** A rule's short name, e.g. "Run rule 2". */
export function ruleLabel(rule: AlertRule): string {
  return RULE_LABELS[rule]
}

/** What a rule means, in words for the lead. */
export function ruleWords(rule: AlertRule): string {
  return RULE_WORDS[rule]
}

/** A figure with as many decimals as it needs, up to `max` (no trailing zeros). */
export function formatFigure(value: number, max = 4): string {
  return Number(value.toFixed(max)).toString()
}

/** A size for plain words: two significant figures, e.g. 1.96 → "2", 0.0437 → "0.044". */
export function roughFigure(value: number): string {
  return Number(value.toPrecision(2)).toString()
}

const percent = (fraction: number) => `${(fraction * 100).toFixed(1)} %`

/** What a check is, as far as the hint needs it. */
export interface HintCheck {
  unit: string | null
  derived: string | null
}

const TURN_FORMULAS = ['turns_from_inductance', 'turn_deviation', 'secondary_turns_from_ratio']

/**
 * What a lead should look at first when a check of a station kind goes out of control, or when
 * a step's first-pass yield falls (no check). The shop's usual first suspects; common practice,
 * no source.
 */
export function whatToCheck(kind: StationKind, check: HintCheck | null): string {
  if (!check) return "look at this step's defect codes (the Pareto on the Yield board)"
  const quantity = check.unit ? (UNITS[check.unit as Unit]?.quantity ?? null) : null
  if (kind === 'winding') {
    if (check.derived === 'winding_balance')
      return 'check that both primary halves were wound with the same turns'
    if ((check.derived && TURN_FORMULAS.includes(check.derived)) || quantity === 'count')
      return 'check the turn counter and recount a suspect unit'
    if (quantity === 'inductance') return "check the core lot in use and the LCR meter's set-up"
    if (quantity === 'voltage') return 'check the ratio-test fixture and the turn counter'
    return "check the bench's tools against the work instruction"
  }
  if (kind === 'soldering') return "check the iron's tip temperature and the last joints made"
  if (kind === 'hipot') return 'check the test leads, the fixture and the insulation of these units'
  if (kind === 'load_test') return 'check the load bank, the input supply and the meters'
  return 'check the measuring tool, its calibration and the work instruction'
}

/** What an alert is about, as the e-mail and the alerts panel name it. */
export interface AlertSubject {
  rule: AlertRule
  details: AlertDetails
  lotNumber: string
  stepName: string
  checkLabel: string | null
  /** The check's unit of measurement, e.g. `mH`. */
  checkUnit: string | null
}

function sizeWords(d: RunRuleAlertDetails, unit: string | null): string {
  const size = roughFigure(d.shift)
  if (unit === 'turns')
    return `about ${size} turn${size === '1' ? '' : 's'} ${d.side === 'above' ? 'over' : 'under'}`
  return `about ${size}${unit ? ` ${unit}` : ''} ${d.side === 'above' ? 'high' : 'low'}`
}

/**
 * What happened, in plain words and short enough for one line, e.g. "Winding bench 2: 6 of the
 * last 8 units read about 2 turns over on Secondary turns from ratio".
 */
export function alertWhat(a: AlertSubject): string {
  const d = a.details
  const where = d.station ?? a.stepName
  if (d.kind === 'fpy')
    return `${where}: first-pass yield ${percent(d.fpy)} (${d.passedFirst} of ${d.firstAttempts} first attempts) is below the ${formatFigure(d.thresholdPercent)} % threshold`
  const count = d.window.length
  const verb = d.outCount === 1 ? 'reads' : 'read'
  const of = count === 1 ? '1 unit' : `${d.outCount} of the last ${count} units`
  return `${where}: ${of} ${verb} ${sizeWords(d, a.checkUnit)} on ${a.checkLabel ?? 'the check'}`
}

/** What to look at first, e.g. "check the turn counter and recount a suspect unit". */
export function alertHint(a: AlertSubject): string {
  return a.details.hint ?? whatToCheck('other', null)
}

/**
 * What happened and what to look at, in plain words, e.g. "Winding bench 2: 6 of the last 8
 * units read about 2 turns over on Secondary turns from ratio (all by Ann Ode); check the turn
 * counter and recount a suspect unit."
 */
export function alertSummary(a: AlertSubject): string {
  const d = a.details
  const by = d.kind === 'run_rule' && d.operator ? ` (all by ${d.operator})` : ''
  return `${alertWhat(a)}${by}; ${alertHint(a)}.`
}

/** The rules of an alert as stored: one for an FPY alert, every broken one for an episode. */
export function alertRules(d: AlertDetails): AlertRule[] {
  return d.kind === 'fpy' ? ['fpy_below_threshold'] : d.rules.map(runRuleName)
}

/** The statistics in one line, e.g. "Run rules 1, 2 broken from unit U09 (points 9–12 of 20)". */
export function alertHeadline(a: AlertSubject): string {
  const d = a.details
  if (d.kind === 'fpy')
    return `First-pass yield ${percent(d.fpy)} is below ${formatFigure(d.thresholdPercent)} % (${d.passedFirst} of ${d.firstAttempts} first attempts passed)`
  const rules = `run rule${d.rules.length > 1 ? 's' : ''} ${d.rules.join(', ')}`
  const span = d.start === d.last ? `point ${d.start + 1}` : `points ${d.start + 1}–${d.last + 1}`
  return `${a.checkLabel ?? 'Check'} broke ${rules} from unit ${d.serial} (${span} of ${d.points} in build order)`
}

/** The e-mail subject: lot, step and what went wrong. */
export function alertEmailSubject(a: AlertSubject): string {
  const d = a.details
  const what =
    d.kind === 'fpy'
      ? `FPY ${percent(d.fpy)} below ${formatFigure(d.thresholdPercent)} %`
      : `${a.checkLabel ?? 'check'} out of control (run rule${d.rules.length > 1 ? 's' : ''} ${d.rules.join(', ')})`
  return `Quality alert: lot ${a.lotNumber}, ${a.stepName}: ${what}`
}

/** How the chart's centre and sigma were found, for the alert text. */
export function chartBasis(d: RunRuleAlertDetails, unit: string | null): string {
  const u = unit ? ` ${unit}` : ''
  const whence = {
    nominal: "the check's nominal",
    lot_median: "the lot's median: this value carries the core's AL tolerance",
    lot_mean: 'the lot mean; the check has no nominal',
  }[d.centreSource]
  const centre = `centre ${formatFigure(d.centre)}${u} (${whence})`
  return `${centre}; σ ${formatFigure(d.sigma)}${u} (within sigma: average moving range of the lot's ${d.points} values in build order / 1.128)`
}

/** The statistics behind an alert, one sentence a line. */
export function alertStatistics(a: AlertSubject): string[] {
  const d = a.details
  if (d.kind === 'fpy')
    return [
      `First-pass yield at this step: ${percent(d.fpy)} (${d.passedFirst} of ${d.firstAttempts} units passed at their first attempt).`,
      `95 % Wilson interval: ${percent(d.interval.low)} to ${percent(d.interval.high)}.`,
      `Threshold set on the revision: ${formatFigure(d.thresholdPercent)} % (judged once ${FPY_MIN_FIRST_ATTEMPTS} units have a first attempt).`,
    ]
  const u = a.checkUnit ? ` ${a.checkUnit}` : ''
  return [
    `${alertHeadline(a)}.`,
    ...d.rules.map((r) => `Run rule ${r}: ${ruleWords(runRuleName(r))}.`),
    `Chart: ${chartBasis(d, a.checkUnit)}.`,
    `Last points, in build order: ${d.window.map((p) => `${p.serial} ${formatFigure(p.value)}${u}${p.station ? ` (${p.station})` : ''}`).join('; ')}.`,
  ]
}

/** The plain-text body of an episode's e-mail: plain words, the link, then the statistics. */
export function alertEmailText(a: AlertSubject, lotUrl: string): string {
  return [
    `Lot ${a.lotNumber}, step ${a.stepName}.`,
    alertSummary(a),
    '',
    `Open the lot: ${lotUrl}`,
    '',
    'The figures:',
    ...alertStatistics(a),
    '',
    'This is one e-mail for this episode: no other comes for this lot, step and check until its',
    'values are back in control. Acknowledge the alert on the Yield board or the lot page.',
  ].join('\n')
}

/** One alert of a digest: what it is about and where to open it. */
export interface DigestItem {
  subject: AlertSubject
  lotUrl: string
}

/** The digest's subject, e.g. "Quality alerts: 3 new episodes". */
export function digestEmailSubject(items: readonly DigestItem[]): string {
  const lots = new Set(items.map((i) => i.subject.lotNumber))
  return `Quality alerts: ${items.length} new episode${items.length === 1 ? '' : 's'} on ${lots.size} lot${lots.size === 1 ? '' : 's'}`
}

/** The digest's body: one paragraph per alert, plain words first, oldest first. */
export function digestEmailText(items: readonly DigestItem[], windowMinutes: number): string {
  const lines = [
    `${items.length} quality alert${items.length === 1 ? '' : 's'} came in since the last alert e-mail. You get at most one such digest every ${windowMinutes} minutes.`,
    '',
  ]
  for (const { subject, lotUrl } of items)
    lines.push(
      `Lot ${subject.lotNumber}, ${subject.stepName}: ${alertSummary(subject)}`,
      `  ${alertHeadline(subject)}`,
      `  ${lotUrl}`,
      '',
    )
  lines.push('Acknowledge them on the Yield board or the lot pages.')
  return lines.join('\n')
}

/** A numeric check of a step, as far as grouping it into series needs. */
export interface SeriesCheck {
  id: string
  key: string
  position: number
  unit: string | null
  nominal: number | null
  derived: string | null
  derivedInputs: Record<string, string> | null
}

/** Checks judged as one series: a check and every check derived from it, or that it derives from. */
export interface CheckSeries<C extends SeriesCheck> {
  /** The check whose values are judged and named: the most telling derived one. */
  head: C
  members: C[]
  /**
   * The centre the head is judged against: its nominal, except for a value that carries the
   * core's AL tolerance (an inductance, or turns estimated from one), which is judged against
   * the lot's own mean (DESIGN.md §7: ungapped ferrite AL is often ±25 %).
   */
  nominal: number | null
}

// Which derived check speaks best for its series: the precise turn count first (DESIGN.md §7).
const HEAD_ORDER = [
  'secondary_turns_from_ratio',
  'turn_deviation',
  'turns_from_inductance',
  'winding_balance',
]
const AL_BOUND = ['turns_from_inductance', 'turn_deviation']

/**
 * Groups a step's numeric checks into the series that alerts judge: the inductance, the turns
 * estimated from it and their deviation are one reading of one winding, so they make one
 * series and one alert, not three. Sorted by the head's position.
 */
export function checkSeries<C extends SeriesCheck>(checks: readonly C[]): CheckSeries<C>[] {
  const byKey = new Map(checks.map((c) => [c.key, c]))
  const parent = new Map(checks.map((c) => [c.key, c.key]))
  const root = (k: string): string => {
    let r = k
    while (parent.get(r) !== r) r = parent.get(r)!
    return r
  }
  for (const c of checks)
    for (const input of Object.values(c.derivedInputs ?? {}))
      if (byKey.has(input)) parent.set(root(input), root(c.key))
  const groups = new Map<string, C[]>()
  for (const c of [...checks].sort((a, b) => a.position - b.position))
    groups.set(root(c.key), [...(groups.get(root(c.key)) ?? []), c])
  const rank = (c: C) => {
    const at = c.derived ? HEAD_ORDER.indexOf(c.derived) : -1
    return at >= 0 ? at : c.derived ? HEAD_ORDER.length : HEAD_ORDER.length + 1
  }
  return [...groups.values()]
    .map((members) => {
      const head = [...members].sort((a, b) => rank(a) - rank(b) || a.position - b.position)[0]!
      const quantity = head.unit ? (UNITS[head.unit as Unit]?.quantity ?? null) : null
      const isAlBound =
        (head.derived && AL_BOUND.includes(head.derived)) || quantity === 'inductance'
      return { head, members, nominal: isAlBound ? null : head.nominal }
    })
    .sort((a, b) => a.head.position - b.head.position)
}
