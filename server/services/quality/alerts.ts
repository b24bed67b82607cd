import { randomUUID } from 'node:crypto'
import type { Transaction } from 'sequelize'
import {
  alertEmailSubject,
  alertEmailText,
  alertHeadline,
  fpyBreach,
  runRuleBreaches,
  runRuleName,
} from '../../../shared/quality/alerts'
import type {
  AlertDetails,
  AlertRule,
  AlertStatus,
  AlertSubject,
  ChartPoint,
} from '../../../shared/quality/alerts'
import type { AlertDto, AlertQuery } from '../../../shared/schemas/alerts'
import { env } from '../../env'
import { AppError } from '../../errors'
import { logger } from '../../logger'
import { Alert, Check, Lot, Revision, RouteStep, User } from '../../models'
import { recordAudit } from '../admin'
import type { Actor } from '../admin'
import { queueEmail } from '../mail'
import { select, withTransaction } from '../../db/sql'

/** Who raises alerts and sends their e-mails in the audit log: the alerts worker, no person. */
export const ALERTS_ACTOR: Actor = { id: null, email: 'alerts-worker@waymark' }

/** The lot page a lead opens from the e-mail. */
export function lotPageUrl(lotId: string): string {
  return `${env.publicBaseUrl.replace(/\/$/, '')}/lots/${encodeURIComponent(lotId)}`
}

interface Candidate {
  rule: AlertRule
  checkId: string | null
  checkLabel: string | null
  checkUnit: string | null
  details: AlertDetails
}

async function stepFirstAttempts(lotId: string, stepId: string) {
  const [row] = await select<{ first_attempts: string; passed_first: string }>(
    `SELECT count(*) FILTER (WHERE sr.attempt = 1) AS first_attempts,
            count(*) FILTER (WHERE sr.attempt = 1 AND sr.result = 'pass') AS passed_first
       FROM step_runs sr JOIN units u ON u.id = sr.unit_id
      WHERE u.lot_id = :lotId AND sr.step_id = :stepId`,
    { replacements: { lotId, stepId } },
  )
  return {
    firstAttempts: Number(row?.first_attempts ?? 0),
    passedFirst: Number(row?.passed_first ?? 0),
  }
}

/**
 * The lot's values of each numeric check of a step, in build order (when the step run finished).
 * Every run counts, a rework's second winding too: each is a part the bench made.
 */
async function checkSeries(
  lotId: string,
  stepId: string,
  checkIds: string[],
): Promise<Map<string, ChartPoint[]>> {
  const series = new Map<string, ChartPoint[]>(checkIds.map((id) => [id, []]))
  if (!checkIds.length) return series
  const rows = await select<{ check_id: string; serial: string; value: number }>(
    `SELECT m.check_id, u.serial, m.value_number AS value
       FROM step_runs sr
       JOIN units u ON u.id = sr.unit_id
       JOIN measurements m ON m.step_run_id = sr.id
      WHERE u.lot_id = :lotId AND sr.step_id = :stepId AND m.check_id IN (:checkIds)
        AND m.value_number IS NOT NULL
      ORDER BY sr.finished_at, sr.id`,
    { replacements: { lotId, stepId, checkIds } },
  )
  for (const r of rows) series.get(r.check_id)?.push({ serial: r.serial, value: Number(r.value) })
  return series
}

/** Every alert the lot's step deserves now, whether or not it was raised before. */
async function candidates(lot: Lot, step: RouteStep, revision: Revision): Promise<Candidate[]> {
  const found: Candidate[] = []
  const fpy = fpyBreach({
    ...(await stepFirstAttempts(lot.id, step.id)),
    thresholdPercent: revision.fpyThresholdPercent,
  })
  if (fpy)
    found.push({
      rule: 'fpy_below_threshold',
      checkId: null,
      checkLabel: null,
      checkUnit: null,
      details: fpy,
    })
  // Run rules watch the winding benches (DESIGN.md §1: catch a drifting bench early).
  if (step.stationKind !== 'winding') return found
  const checks = await Check.findAll({
    where: { stepId: step.id, kind: 'numeric' },
    order: [['position', 'ASC']],
  })
  const series = await checkSeries(
    lot.id,
    step.id,
    checks.map((c) => c.id),
  )
  for (const check of checks)
    for (const details of runRuleBreaches(series.get(check.id) ?? [], check.nominal))
      found.push({
        rule: runRuleName(details.rule),
        checkId: check.id,
        checkLabel: check.label,
        checkUnit: check.unit,
        details,
      })
  return found
}

/**
 * Stores an alert unless the same lot, step, rule and check has one, and only then e-mails the
 * leads, in the same transaction: a second evaluation, or two workers at once, send nothing more.
 */
async function raise(
  lot: Lot,
  step: RouteStep,
  c: Candidate,
  transaction: Transaction,
): Promise<boolean> {
  const inserted = await select<{ id: string }>(
    `INSERT INTO alerts (id, lot_id, step_id, rule, check_id, details, status, created_at, updated_at)
     VALUES (:id, :lotId, :stepId, :rule, :checkId, CAST(:details AS jsonb), 'open', now(), now())
     ON CONFLICT ON CONSTRAINT alerts_once DO NOTHING
     RETURNING id`,
    {
      replacements: {
        id: randomUUID(),
        lotId: lot.id,
        stepId: step.id,
        rule: c.rule,
        checkId: c.checkId,
        details: JSON.stringify(c.details),
      },
      transaction,
    },
  )
  const id = inserted[0]?.id
  if (!id) return false
  const subject: AlertSubject = { ...c, lotNumber: lot.number, stepName: step.name }
  await recordAudit(
    ALERTS_ACTOR,
    {
      action: 'alert.raise',
      entity: 'alert',
      entityId: id,
      after: { lot: lot.number, step: step.name, rule: c.rule, check: c.checkLabel },
    },
    transaction,
  )
  const leads = await User.findAll({
    where: { role: 'lead', isActive: true },
    attributes: ['email'],
    order: [['email', 'ASC']],
    transaction,
  })
  if (!leads.length) {
    logger.warn({ alertId: id }, 'alert raised, but there is no active lead to e-mail')
    return true
  }
  await queueEmail(
    {
      to: leads.map((u) => u.email),
      subject: alertEmailSubject(subject),
      text: alertEmailText(subject, lotPageUrl(lot.id)),
      related: { entity: 'alert', id },
    },
    ALERTS_ACTOR,
    transaction,
  )
  return true
}

/**
 * Re-evaluates one lot's step: the step FPY against the revision's threshold and, at a winding
 * step, the run rules on each numeric check. Returns how many new alerts it raised. Safe to run
 * any number of times: an alert already raised is neither stored nor sent again.
 */
export async function evaluateLotStep(lotId: string, stepId: string): Promise<number> {
  const lot = await Lot.findByPk(lotId)
  const step = await RouteStep.findByPk(stepId)
  if (!lot || !step) return 0
  const revision = (await Revision.findByPk(lot.revisionId))!
  if (step.revisionId !== revision.id) return 0
  let raised = 0
  for (const c of await candidates(lot, step, revision))
    if (await withTransaction((t) => raise(lot, step, c, t))) raised++
  if (raised) logger.info({ lot: lot.number, step: step.name, raised }, 'quality alerts raised')
  return raised
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
  check_id: string | null
  check_label: string | null
  check_unit: string | null
  details: AlertDetails
  status: AlertStatus
  acknowledged_by: string | null
  acknowledged_by_name: string | null
  acknowledged_at: Date | null
  created_at: Date
}

const SELECT_ALERT = `
  SELECT a.id, a.lot_id, l.number AS lot_number, a.step_id, s.name AS step_name, a.rule,
         a.check_id, c.label AS check_label, c.unit AS check_unit, a.details, a.status,
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
    checkId: r.check_id,
    checkLabel: r.check_label,
    checkUnit: r.check_unit,
    details: r.details,
    headline: alertHeadline(subject),
    status: r.status,
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

/** A lead acknowledges an open alert; acknowledging one twice is a 409 naming who did it first. */
export async function acknowledgeAlert(id: string, actor: Actor): Promise<AlertDto> {
  return withTransaction(async (transaction) => {
    const alert = await Alert.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!alert) throw AppError.notFound(`alert ${id}`)
    if (alert.status === 'acknowledged') {
      const by = alert.acknowledgedBy
        ? await User.findByPk(alert.acknowledgedBy, { transaction })
        : null
      throw AppError.conflict(
        'alert_acknowledged',
        `this alert was already acknowledged${by ? ` by ${by.name}` : ''} at ${alert.acknowledgedAt?.toISOString() ?? '?'}`,
      )
    }
    await alert.update(
      { status: 'acknowledged', acknowledgedBy: actor.id, acknowledgedAt: new Date() },
      { transaction },
    )
    await recordAudit(
      actor,
      {
        action: 'alert.acknowledge',
        entity: 'alert',
        entityId: id,
        before: { status: 'open' },
        after: { status: 'acknowledged' },
      },
      transaction,
    )
    return alertDto(id, transaction)
  })
}
