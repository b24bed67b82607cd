// Quality alerts (issue #5, point 5): when a lot's step has fallen below its first-pass-yield
// threshold, or a winding check's values in build order break a Western Electric run rule.
// Pure: the alerts worker feeds in the figures it read; the e-mail and the UI word them here.
import { wilsonInterval, type ProportionInterval } from './proportion'
import { runRuleViolations } from './runRules'
import { capability } from './spc'

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

/**
 * Run rules are applied only from this many values on: rule 4 needs 8 points, and a sigma from
 * fewer than 7 moving ranges swings too much to be worth an e-mail (our choice; no source).
 */
export const RUN_RULE_MIN_POINTS = 8

/** The figures behind an FPY alert, as stored in `alerts.details`. */
export interface FpyAlertDetails {
  kind: 'fpy'
  passedFirst: number
  firstAttempts: number
  fpy: number
  thresholdPercent: number
  /** 95 % Wilson interval of the step FPY. */
  interval: ProportionInterval
}

/** One value of a check, in build order, with the unit it was measured on. */
export interface ChartPoint {
  serial: string
  value: number
}

/** The figures behind a run-rule alert, as stored in `alerts.details`. */
export interface RunRuleAlertDetails {
  kind: 'run_rule'
  rule: 1 | 2 | 3 | 4
  /** The check's nominal when it has one, else the mean of the lot's values. */
  centre: number
  centreSource: 'nominal' | 'lot_mean'
  /** Within sigma: average moving range of the lot's values in build order / d2 (1.128). */
  sigma: number
  /** How many values the chart had when the rule tripped. */
  points: number
  /** 0-based position in build order of the point at which the rule's window is met. */
  index: number
  serial: string
  value: number
  /** The rule's window of points ending at `index`, oldest first. */
  window: ChartPoint[]
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

const WINDOWS: Record<1 | 2 | 3 | 4, number> = { 1: 1, 2: 3, 3: 5, 4: 8 }

/**
 * The run rules a check's values break, one entry per rule at the first index where it trips.
 * Centre: the check's nominal when set, else the lot mean. Sigma: the within sigma, average
 * moving range / 1.128, so a shift part-way through the lot does not widen its own limits.
 * Fewer than `RUN_RULE_MIN_POINTS` values, or no spread at all, gives no alert.
 */
export function runRuleBreaches(
  points: readonly ChartPoint[],
  nominal: number | null,
): RunRuleAlertDetails[] {
  if (points.length < RUN_RULE_MIN_POINTS) return []
  const values = points.map((p) => p.value)
  const { mean, sdWithin } = capability(values)
  if (mean === null || sdWithin === null || !(sdWithin > 0)) return []
  const centre = nominal ?? mean
  const firstByRule = new Map<1 | 2 | 3 | 4, number>()
  for (const v of runRuleViolations(values, centre, sdWithin))
    if (!firstByRule.has(v.rule)) firstByRule.set(v.rule, v.index)
  return [...firstByRule.entries()]
    .sort(([a], [b]) => a - b)
    .map(([rule, index]) => ({
      kind: 'run_rule',
      rule,
      centre,
      centreSource: nominal === null ? 'lot_mean' : 'nominal',
      sigma: sdWithin,
      points: points.length,
      index,
      serial: points[index]!.serial,
      value: points[index]!.value,
      window: points.slice(index + 1 - WINDOWS[rule], index + 1).map((p) => ({ ...p })),
    }))
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

const percent = (fraction: number) => `${(fraction * 100).toFixed(1)} %`

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

/** One line saying what tripped, e.g. "FPY 80.0 % below 90 % (8 of 10 first attempts)". */
export function alertHeadline(a: AlertSubject): string {
  const d = a.details
  if (d.kind === 'fpy')
    return `First-pass yield ${percent(d.fpy)} is below ${formatFigure(d.thresholdPercent)} % (${d.passedFirst} of ${d.firstAttempts} first attempts passed)`
  const unit = a.checkUnit ? ` ${a.checkUnit}` : ''
  return `${a.checkLabel ?? 'Check'} broke run rule ${d.rule} at unit ${d.serial}: ${formatFigure(d.value)}${unit}, point ${d.index + 1} of ${d.points} in build order`
}

/** The e-mail subject: lot, step and rule. */
export function alertEmailSubject(a: AlertSubject): string {
  const what =
    a.details.kind === 'fpy'
      ? `FPY ${percent(a.details.fpy)} below ${formatFigure(a.details.thresholdPercent)} %`
      : `${a.checkLabel ?? 'check'} broke run rule ${a.details.rule}`
  return `Quality alert: lot ${a.lotNumber}, ${a.stepName}: ${what}`
}

/** How the chart's centre and sigma were found, for the alert text. */
export function chartBasis(d: RunRuleAlertDetails, unit: string | null): string {
  const u = unit ? ` ${unit}` : ''
  const centre =
    d.centreSource === 'nominal'
      ? `centre ${formatFigure(d.centre)}${u} (the check's nominal)`
      : `centre ${formatFigure(d.centre)}${u} (the lot mean; the check has no nominal)`
  return `${centre}; σ ${formatFigure(d.sigma)}${u} (within sigma: average moving range of the lot's ${d.points} values in build order / 1.128)`
}

/** The plain-text body of the alert e-mail: the figures that tripped it and a link to the lot. */
export function alertEmailText(a: AlertSubject, lotUrl: string): string {
  const d = a.details
  const what =
    d.kind === 'fpy'
      ? ruleWords(a.rule)
      : `${ruleLabel(a.rule).toLowerCase()} (${ruleWords(a.rule)})`
  const lines = [`Lot ${a.lotNumber}, step ${a.stepName}: ${what}.`, '']
  if (d.kind === 'fpy') {
    lines.push(
      `First-pass yield at this step: ${percent(d.fpy)} (${d.passedFirst} of ${d.firstAttempts} units passed at their first attempt).`,
      `95 % Wilson interval: ${percent(d.interval.low)} to ${percent(d.interval.high)}.`,
      `Threshold set on the revision: ${formatFigure(d.thresholdPercent)} % (judged once ${FPY_MIN_FIRST_ATTEMPTS} units have a first attempt).`,
    )
  } else {
    const u = a.checkUnit ? ` ${a.checkUnit}` : ''
    lines.push(
      `${alertHeadline(a)}.`,
      `Chart: ${chartBasis(d, a.checkUnit)}.`,
      `Points in the rule's window, in build order: ${d.window.map((p) => `${p.serial} ${formatFigure(p.value)}${u}`).join('; ')}.`,
    )
  }
  lines.push(
    '',
    `Open the lot: ${lotUrl}`,
    '',
    'Acknowledge the alert on the lot page once you have looked into it. This alert is sent once per lot, step and rule.',
  )
  return lines.join('\n')
}
