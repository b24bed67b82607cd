import { randomUUID } from 'node:crypto'
import type { Transaction } from 'sequelize'
import {
  alertHeadline,
  alertRules,
  alertSummary,
  checkSeries,
  fpyBreach,
  whatToCheck,
} from '../../../shared/quality/alerts'
import type {
  AlertDetails,
  AlertRule,
  AlertStatus,
  AlertSubject,
  FpyAlertDetails,
  RunRuleAlertDetails,
} from '../../../shared/quality/alerts'
import {
  planEpisodes,
  practicalShift,
  readEpisode,
  seriesBasis,
} from '../../../shared/quality/episodes'
import type { Episode, EpisodePoint, SeriesBasis } from '../../../shared/quality/episodes'
import type {
  AcknowledgeAlertsInput,
  AlertDto,
  AlertQuery,
  AlertsAcknowledgedDto,
} from '../../../shared/schemas/alerts'
import { AppError } from '../../errors'
import { logger } from '../../logger'
import { Check, Lot, Revision, RouteStep } from '../../models'
import type { Check as CheckModel } from '../../models'
import { auditAction, recordAudit, statusMove } from '../admin'
import type { Actor } from '../admin'
import { execute, select, withTransaction } from '../../db/sql'
import { ALERTS_ACTOR, noticeLeads } from './alertMail'

export { ALERTS_ACTOR, lotPageUrl, sendDueDigests, alertDigestWindowMs } from './alertMail'

// Alerts as episodes (issue 19, point 2). Each series of a lot's step is judged on its own: the
// step's first-pass yield against the revision's threshold, and at a winding step each series of
// numeric checks (a check with those derived from it) by the run rules. A series out of control
// holds one alert (one row whose `ended_at` is null) that grows with the rules its points break;
// the alert ends when the series is back in control, and only then can a new one be raised.

/** Leads whose digest is due later, for the worker to schedule. */
export interface EvaluationResult {
  raised: number
  ended: number
  digests: { leadId: string; dueAt: Date }[]
}

async function stepFirstAttempts(lotId: string, stepId: string) {
  const [row] = await select<{ first_attempts: string; passed_first: string; stations: string[] }>(
    `SELECT count(*) FILTER (WHERE sr.attempt = 1) AS first_attempts,
            count(*) FILTER (WHERE sr.attempt = 1 AND sr.result = 'pass') AS passed_first,
            array_remove(array_agg(DISTINCT st.name)
              FILTER (WHERE sr.attempt = 1 AND sr.result = 'fail'), NULL) AS stations
       FROM step_runs sr JOIN units u ON u.id = sr.unit_id
       LEFT JOIN stations st ON st.id = sr.station_id
      WHERE u.lot_id = :lotId AND sr.step_id = :stepId`,
    { replacements: { lotId, stepId } },
  )
  return {
    firstAttempts: Number(row?.first_attempts ?? 0),
    passedFirst: Number(row?.passed_first ?? 0),
    station: row?.stations?.length === 1 ? row.stations[0]! : null,
  }
}

/**
 * The lot's values of each numeric check of a step, in build order (when the step run finished),
 * with the station and operator of each. Every run counts, a rework's second winding too: each
 * is a part the bench made.
 */
async function checkPoints(
  lotId: string,
  stepId: string,
  checkIds: string[],
): Promise<Map<string, EpisodePoint[]>> {
  const series = new Map<string, EpisodePoint[]>(checkIds.map((id) => [id, []]))
  if (!checkIds.length) return series
  const rows = await select<{
    check_id: string
    serial: string
    value: number
    station: string | null
    operator: string | null
  }>(
    `SELECT m.check_id, u.serial, m.value_number AS value, st.name AS station, us.name AS operator
       FROM step_runs sr
       JOIN units u ON u.id = sr.unit_id
       JOIN measurements m ON m.step_run_id = sr.id
       LEFT JOIN stations st ON st.id = sr.station_id
       LEFT JOIN users us ON us.id = sr.operator_id
      WHERE u.lot_id = :lotId AND sr.step_id = :stepId AND m.check_id IN (:checkIds)
        AND m.value_number IS NOT NULL
      ORDER BY sr.finished_at, sr.id`,
    { replacements: { lotId, stepId, checkIds } },
  )
  for (const r of rows)
    series.get(r.check_id)?.push({
      serial: r.serial,
      value: Number(r.value),
      station: r.station,
      operator: r.operator,
    })
  return series
}

interface StoredSeries {
  active: { id: string; episode_start: number | null } | null
  armedFrom: number
}

/** Locks one series of a lot's step (released at commit) and reads what is stored of it. */
async function storedSeries(
  lotId: string,
  stepId: string,
  checkId: string | null,
  transaction: Transaction,
): Promise<StoredSeries> {
  const replacements = {
    lotId,
    stepId,
    checkId,
    key: `alert:${lotId}:${stepId}:${checkId ?? 'fpy'}`,
  }
  await execute('SELECT pg_advisory_xact_lock(hashtext(:key))', { replacements, transaction })
  const [active] = await select<{ id: string; episode_start: number | null }>(
    `SELECT id, episode_start FROM alerts
      WHERE lot_id = :lotId AND step_id = :stepId AND check_id IS NOT DISTINCT FROM :checkId
        AND ended_at IS NULL`,
    { replacements, transaction },
  )
  const [armed] = await select<{ at: number | null }>(
    `SELECT max(rearm_index) AS at FROM alerts
      WHERE lot_id = :lotId AND step_id = :stepId AND check_id IS NOT DISTINCT FROM :checkId`,
    { replacements, transaction },
  )
  return { active: active ?? null, armedFrom: Number(armed?.at ?? 0) }
}

interface SeriesContext {
  lot: Lot
  step: RouteStep
  check: CheckModel | null
}

const subjectOf = (c: SeriesContext, details: AlertDetails): AlertSubject => ({
  rule: alertRules(details)[0]!,
  details,
  lotNumber: c.lot.number,
  stepName: c.step.name,
  checkLabel: c.check?.label ?? null,
  checkUnit: c.check?.unit ?? null,
})

/**
 * Stores a new alert, audits it and tells the leads, in the caller's transaction, at `at` (the
 * demo seed's clock) or now.
 */
async function raise(
  c: SeriesContext,
  details: AlertDetails,
  episode: Episode | null,
  transaction: Transaction,
  at: Date | undefined,
): Promise<{ leadId: string; dueAt: Date }[]> {
  const id = randomUUID()
  const rules = alertRules(details)
  const isOver = episode?.isOver ?? false
  const inserted = await select<{ id: string }>(
    `INSERT INTO alerts (id, lot_id, step_id, rule, rules, check_id, details, status, episode_start,
                         ended_at, rearm_index, created_at, updated_at)
     VALUES (:id, :lotId, :stepId, :rule, ARRAY[:rules]::varchar(32)[], :checkId,
             CAST(:details AS jsonb), 'open', :start, :endedAt, :rearm,
             COALESCE(CAST(:at AS timestamptz), now()), COALESCE(CAST(:at AS timestamptz), now()))
     ON CONFLICT DO NOTHING
     RETURNING id`,
    {
      replacements: {
        id,
        lotId: c.lot.id,
        stepId: c.step.id,
        rule: rules[0],
        rules,
        checkId: c.check?.id ?? null,
        details: JSON.stringify(details),
        start: episode?.start ?? null,
        endedAt: isOver ? (at ?? new Date()) : null,
        rearm: isOver ? episode!.rearmAt : null,
        at: at ?? null,
      },
      transaction,
    },
  )
  if (!inserted.length) return []
  const subject = subjectOf(c, details)
  await recordAudit(
    ALERTS_ACTOR,
    {
      action: 'alert.raise',
      entity: 'alert',
      entityId: id,
      after: {
        lot: c.lot.number,
        step: c.step.name,
        check: c.check?.label ?? null,
        rules,
        summary: alertSummary(subject),
        ...(isOver ? { backInControl: true } : {}),
      },
      at,
    },
    transaction,
  )
  return noticeLeads(id, transaction, at)
}

/**
 * Updates a running alert's figures; ends it (back in control) when `rearmAt` is given, at `at`
 * (the demo seed's clock) or now.
 */
async function carryOn(
  alertId: string,
  details: AlertDetails | null,
  rearmAt: number | null,
  transaction: Transaction,
  at: Date | undefined,
): Promise<void> {
  if (details)
    await execute(
      `UPDATE alerts SET details = CAST(:details AS jsonb), rules = ARRAY[:rules]::varchar(32)[],
              updated_at = COALESCE(CAST(:at AS timestamptz), now())
        WHERE id = :alertId`,
      {
        replacements: {
          alertId,
          details: JSON.stringify(details),
          rules: alertRules(details),
          at: at ?? null,
        },
        transaction,
      },
    )
  if (rearmAt !== null)
    await execute(
      `UPDATE alerts SET ended_at = COALESCE(CAST(:at AS timestamptz), now()),
              rearm_index = :rearmAt, updated_at = COALESCE(CAST(:at AS timestamptz), now())
        WHERE id = :alertId`,
      { replacements: { alertId, rearmAt, at: at ?? null }, transaction },
    )
  if (rearmAt !== null)
    await recordAudit(
      ALERTS_ACTOR,
      {
        action: 'alert.back_in_control',
        entity: 'alert',
        entityId: alertId,
        after: { rearmedFromPoint: rearmAt + 1 },
        at,
      },
      transaction,
    )
}

/** The stored figures of an episode: the statistics and their reading in plain words. */
function episodeDetails(
  c: SeriesContext,
  points: readonly EpisodePoint[],
  basis: SeriesBasis,
  episode: Episode,
): RunRuleAlertDetails {
  const reading = readEpisode(points, episode, basis.centre!, basis.sigma!, basis.minShift)
  return {
    kind: 'run_rule',
    rules: episode.rules,
    centre: basis.centre!,
    centreSource: basis.centreSource,
    sigma: basis.sigma!,
    points: points.length,
    start: episode.start,
    last: episode.last,
    serial: points[episode.start]!.serial,
    ...reading,
    hint: whatToCheck(c.step.stationKind, c.check),
  }
}

async function judgeRunRules(
  c: SeriesContext,
  points: readonly EpisodePoint[],
  nominal: number | null,
  at: Date | undefined,
): Promise<EvaluationResult> {
  const values = points.map((p) => p.value)
  const basis = seriesBasis(values, nominal, practicalShift(c.check!))
  const out: EvaluationResult = { raised: 0, ended: 0, digests: [] }
  if (basis.judgement !== 'judged') return out
  return withTransaction(async (transaction) => {
    const stored = await storedSeries(c.lot.id, c.step.id, c.check!.id, transaction)
    const plan = planEpisodes(values, basis, {
      activeStart: stored.active?.episode_start ?? null,
      armedFrom: stored.armedFrom,
    })
    if (stored.active && plan.active !== undefined) {
      const now = plan.active
      const rearm = now === null ? values.length : now.isOver ? now.rearmAt : null
      await carryOn(
        stored.active.id,
        now ? episodeDetails(c, points, basis, now) : null,
        rearm,
        transaction,
        at,
      )
      if (rearm !== null) out.ended++
    }
    for (const episode of plan.raise) {
      out.digests.push(
        ...(await raise(c, episodeDetails(c, points, basis, episode), episode, transaction, at)),
      )
      out.raised++
      if (episode.isOver) out.ended++
    }
    return out
  })
}

async function judgeFpy(
  c: SeriesContext,
  revision: Revision,
  at: Date | undefined,
): Promise<EvaluationResult> {
  const counts = await stepFirstAttempts(c.lot.id, c.step.id)
  const found = fpyBreach({ ...counts, thresholdPercent: revision.fpyThresholdPercent })
  const breach: FpyAlertDetails | null = found && {
    ...found,
    station: counts.station,
    hint: whatToCheck(c.step.stationKind, null),
  }
  const out: EvaluationResult = { raised: 0, ended: 0, digests: [] }
  return withTransaction(async (transaction) => {
    const stored = await storedSeries(c.lot.id, c.step.id, null, transaction)
    if (stored.active) {
      // Back at or above the threshold ends the episode; still below keeps its figures current.
      await carryOn(stored.active.id, breach, breach ? null : 0, transaction, at)
      if (!breach) out.ended++
      return out
    }
    if (!breach) return out
    out.digests.push(...(await raise(c, breach, null, transaction, at)))
    out.raised++
    return out
  })
}

/**
 * Re-evaluates one lot's step: the step FPY against the revision's threshold and, at a winding
 * step, the run rules on each series of numeric checks. Raises an alert (and its e-mail) for
 * each new episode, keeps a running one's figures current, and ends those back in control.
 * Safe to run any number of times, and by two workers at once: each series is locked while it
 * is judged, and an episode already stored is neither stored nor sent again. `at` stamps what
 * it stores and sends when it is not now: the demo seed judges its past as it plays it.
 */
export async function evaluateLotStep(
  lotId: string,
  stepId: string,
  at?: Date,
): Promise<EvaluationResult> {
  const total: EvaluationResult = { raised: 0, ended: 0, digests: [] }
  const lot = await Lot.findByPk(lotId)
  const step = await RouteStep.findByPk(stepId)
  if (!lot || !step) return total
  const revision = (await Revision.findByPk(lot.revisionId))!
  if (step.revisionId !== revision.id) return total
  const add = (r: EvaluationResult) => {
    total.raised += r.raised
    total.ended += r.ended
    total.digests.push(...r.digests)
  }
  add(await judgeFpy({ lot, step, check: null }, revision, at))
  // Run rules watch the winding benches (DESIGN.md §1: catch a drifting bench early).
  if (step.stationKind === 'winding') {
    const checks = await Check.findAll({
      where: { stepId: step.id, kind: 'numeric' },
      order: [['position', 'ASC']],
    })
    const series = checkSeries(checks)
    const points = await checkPoints(
      lot.id,
      step.id,
      series.map((s) => s.head.id),
    )
    for (const s of series)
      add(
        await judgeRunRules(
          { lot, step, check: s.head },
          points.get(s.head.id) ?? [],
          s.nominal,
          at,
        ),
      )
  }
  if (total.raised || total.ended)
    logger.info(
      { lot: lot.number, step: step.name, ...total, digests: undefined },
      'quality alerts',
    )
  return total
}

/** Lots and steps with a step run finished since `since`: what the worker's sweep re-checks. */
export async function lotStepsRunSince(since: Date): Promise<{ lotId: string; stepId: string }[]> {
  return select<{ lotId: string; stepId: string }>(
    `SELECT DISTINCT u.lot_id AS "lotId", sr.step_id AS "stepId"
       FROM step_runs sr JOIN units u ON u.id = sr.unit_id
      WHERE sr.finished_at >= :since`,
    { replacements: { since } },
  )
}

interface AlertRow {
  id: string
  lot_id: string
  lot_number: string
  step_id: string
  step_name: string
  rule: AlertRule
  rules: AlertRule[]
  check_id: string | null
  check_label: string | null
  check_unit: string | null
  details: AlertDetails
  status: AlertStatus
  ended_at: Date | null
  acknowledged_by: string | null
  acknowledged_by_name: string | null
  acknowledged_at: Date | null
  created_at: Date
}

const SELECT_ALERT = `
  SELECT a.id, a.lot_id, l.number AS lot_number, a.step_id, s.name AS step_name, a.rule, a.rules,
         a.check_id, c.label AS check_label, c.unit AS check_unit, a.details, a.status, a.ended_at,
         a.acknowledged_by, ab.name AS acknowledged_by_name, a.acknowledged_at, a.created_at
    FROM alerts a
    JOIN lots l ON l.id = a.lot_id
    JOIN route_steps s ON s.id = a.step_id
    LEFT JOIN checks c ON c.id = a.check_id
    LEFT JOIN users ab ON ab.id = a.acknowledged_by`

function toDto(r: AlertRow): AlertDto {
  const subject: AlertSubject = {
    rule: r.rule,
    details: r.details,
    lotNumber: r.lot_number,
    stepName: r.step_name,
    checkLabel: r.check_label,
    checkUnit: r.check_unit,
  }
  return {
    id: r.id,
    lotId: r.lot_id,
    lotNumber: r.lot_number,
    stepId: r.step_id,
    stepName: r.step_name,
    rule: r.rule,
    rules: r.rules.length ? r.rules : [r.rule],
    checkId: r.check_id,
    checkLabel: r.check_label,
    checkUnit: r.check_unit,
    details: r.details,
    summary: alertSummary(subject),
    headline: alertHeadline(subject),
    status: r.status,
    isBackInControl: r.ended_at !== null,
    endedAt: r.ended_at ? new Date(r.ended_at).toISOString() : null,
    acknowledgedBy:
      r.acknowledged_by && r.acknowledged_by_name
        ? { id: r.acknowledged_by, name: r.acknowledged_by_name }
        : null,
    acknowledgedAt: r.acknowledged_at ? new Date(r.acknowledged_at).toISOString() : null,
    createdAt: new Date(r.created_at).toISOString(),
  }
}

/** Alerts, open ones first, newest first within each; at most 200. */
export async function listAlerts(q: AlertQuery): Promise<AlertDto[]> {
  const where = ['TRUE']
  if (q.lotId) where.push('a.lot_id = :lotId')
  if (q.status) where.push('a.status = :status')
  const rows = await select<AlertRow>(
    `${SELECT_ALERT}
      WHERE ${where.join(' AND ')}
      ORDER BY a.status = 'open' DESC, a.created_at DESC, a.id
      LIMIT 200`,
    { replacements: { ...q } },
  )
  return rows.map(toDto)
}

async function alertDto(id: string, transaction?: Transaction): Promise<AlertDto> {
  const [row] = await select<AlertRow>(`${SELECT_ALERT} WHERE a.id = :id`, {
    replacements: { id },
    transaction,
  })
  if (!row) throw AppError.notFound(`alert ${id}`)
  return toDto(row)
}

async function auditAcknowledged(
  actor: Actor,
  ids: string[],
  transaction: Transaction,
): Promise<void> {
  for (const id of ids)
    await auditAction(
      actor,
      'alert.acknowledge',
      id,
      statusMove('open', 'acknowledged'),
      transaction,
    )
}

/** A lead acknowledges an open alert; acknowledging one twice is a 409 naming who did it first. */
export async function acknowledgeAlert(id: string, actor: Actor): Promise<AlertDto> {
  return withTransaction(async (transaction) => {
    const [alert] = await select<{
      status: AlertStatus
      acknowledged_at: Date | null
      by_name: string | null
    }>(
      `SELECT a.status, a.acknowledged_at, u.name AS by_name
         FROM alerts a LEFT JOIN users u ON u.id = a.acknowledged_by
        WHERE a.id = :id FOR UPDATE OF a`,
      { replacements: { id }, transaction },
    )
    if (!alert) throw AppError.notFound(`alert ${id}`)
    if (alert.status === 'acknowledged')
      throw AppError.conflict(
        'alert_acknowledged',
        `this alert was already acknowledged${alert.by_name ? ` by ${alert.by_name}` : ''} at ${alert.acknowledged_at ? new Date(alert.acknowledged_at).toISOString() : '?'}`,
      )
    await execute(
      `UPDATE alerts SET status = 'acknowledged', acknowledged_by = :actorId,
              acknowledged_at = now(), updated_at = now()
        WHERE id = :id`,
      { replacements: { id, actorId: actor.id }, transaction },
    )
    await auditAcknowledged(actor, [id], transaction)
    return alertDto(id, transaction)
  })
}

/**
 * A lead acknowledges every open alert, or every open alert of one lot: one audit row per alert,
 * all in one transaction. Alerts already acknowledged are left as they are (and not counted).
 */
export async function acknowledgeAlerts(
  input: AcknowledgeAlertsInput,
  actor: Actor,
): Promise<AlertsAcknowledgedDto> {
  return withTransaction(async (transaction) => {
    if (input.lotId && !(await Lot.findByPk(input.lotId, { transaction })))
      throw AppError.notFound(`lot ${input.lotId}`)
    const rows = await select<{ id: string }>(
      `UPDATE alerts SET status = 'acknowledged', acknowledged_by = :actorId,
              acknowledged_at = now(), updated_at = now()
        WHERE id IN (SELECT id FROM alerts
                      WHERE status = 'open' ${input.lotId ? 'AND lot_id = :lotId' : ''}
                      ORDER BY id FOR UPDATE)
        RETURNING id`,
      { replacements: { actorId: actor.id, lotId: input.lotId ?? null }, transaction },
    )
    const ids = rows.map((r) => r.id).sort()
    await auditAcknowledged(actor, ids, transaction)
    return { acknowledged: ids.length, ids }
  })
}
