import type { Transaction } from 'sequelize'
import {
  alertEmailSubject,
  alertEmailText,
  digestEmailSubject,
  digestEmailText,
} from '../../../shared/quality/alerts'
import type { AlertDetails, AlertRule, AlertSubject } from '../../../shared/quality/alerts'
import { env } from '../../env'
import { logger } from '../../logger'
import { queueEmail } from '../mail'
import type { Actor } from '../admin'
import { execute, select, withTransaction } from '../../db/sql'

// Alert e-mail (issue 19, point 2): each episode is told to each lead once. A lead who had no
// alert e-mail within the digest window gets the episode's own message at once; one who had
// gets it in a digest when the window is over, with whatever else came meanwhile: at most one
// digest per window per lead. `alert_notices` records who was told of what, by which e-mail.

/** Who sends alert e-mails in the audit log: the alerts worker, no person. */
export const ALERTS_ACTOR: Actor = { id: null, email: 'alerts-worker@waymark' }

/** The digest window: at most one alert digest per lead in this many milliseconds. */
export function alertDigestWindowMs(): number {
  return env.WAYMARK_ALERT_DIGEST_MINUTES * 60_000
}

/** The lot page a lead opens from the e-mail. */
export function lotPageUrl(lotId: string): string {
  return `${env.publicBaseUrl.replace(/\/$/, '')}/lots/${encodeURIComponent(lotId)}`
}

interface Lead {
  id: string
  email: string
}

interface WaitingRow {
  alert_id: string
  lot_id: string
  lot_number: string
  step_name: string
  rule: AlertRule
  details: AlertDetails
  check_label: string | null
  check_unit: string | null
}

/** Serialises the mail decisions for one lead across workers (released at commit). */
async function lockLead(leadId: string, transaction: Transaction): Promise<void> {
  await execute(`SELECT pg_advisory_xact_lock(hashtext('alert-mail:' || :leadId))`, {
    replacements: { leadId },
    transaction,
  })
}

/**
 * Sends what waits for one lead, if the window since the lead's last alert e-mail is over: one
 * waiting alert as its own message, several as one digest. Says whether it queued an e-mail,
 * and when to try again if the window is still running and something waits. Call with the lead locked.
 */
async function mailLead(
  lead: Lead,
  now: Date,
  transaction: Transaction,
): Promise<{ isSent: boolean; dueAt: Date | null }> {
  const waiting = await select<WaitingRow>(
    `SELECT n.alert_id, a.lot_id, l.number AS lot_number, s.name AS step_name, a.rule,
            a.details, c.label AS check_label, c.unit AS check_unit
       FROM alert_notices n
       JOIN alerts a ON a.id = n.alert_id
       JOIN lots l ON l.id = a.lot_id
       JOIN route_steps s ON s.id = a.step_id
       LEFT JOIN checks c ON c.id = a.check_id
      WHERE n.user_id = :leadId AND n.email_id IS NULL
      ORDER BY n.created_at, a.id
      FOR UPDATE OF n`,
    { replacements: { leadId: lead.id }, transaction },
  )
  if (!waiting.length) return { isSent: false, dueAt: null }
  const [last] = await select<{ at: Date | null }>(
    `SELECT max(mailed_at) AS at FROM alert_notices WHERE user_id = :leadId AND mailed_at IS NOT NULL`,
    { replacements: { leadId: lead.id }, transaction },
  )
  const window = alertDigestWindowMs()
  const lastAt = last?.at ? new Date(last.at).getTime() : null
  if (lastAt !== null && now.getTime() - lastAt < window)
    return { isSent: false, dueAt: new Date(lastAt + window) }
  const items = waiting.map((w) => ({
    subject: {
      rule: w.rule,
      details: w.details,
      lotNumber: w.lot_number,
      stepName: w.step_name,
      checkLabel: w.check_label,
      checkUnit: w.check_unit,
    } satisfies AlertSubject,
    lotUrl: lotPageUrl(w.lot_id),
  }))
  const isDigest = items.length > 1
  const email = await queueEmail(
    isDigest
      ? {
          to: lead.email,
          subject: digestEmailSubject(items),
          text: digestEmailText(items, env.WAYMARK_ALERT_DIGEST_MINUTES),
          related: { entity: 'user', id: lead.id },
        }
      : {
          to: lead.email,
          subject: alertEmailSubject(items[0]!.subject),
          text: alertEmailText(items[0]!.subject, items[0]!.lotUrl),
          related: { entity: 'alert', id: waiting[0]!.alert_id },
        },
    ALERTS_ACTOR,
    transaction,
    now,
  )
  await execute(
    `UPDATE alert_notices SET email_id = :emailId, mailed_at = :now, is_digest = :isDigest
      WHERE user_id = :leadId AND alert_id IN (:alertIds)`,
    {
      replacements: {
        emailId: email.id,
        now,
        isDigest,
        leadId: lead.id,
        alertIds: waiting.map((w) => w.alert_id),
      },
      transaction,
    },
  )
  return { isSent: true, dueAt: null }
}

/**
 * Tells every active lead of a new alert, in the transaction that raised it: its own e-mail now
 * (or at `at`, the demo seed's clock), or a place in the lead's next digest. Returns the leads
 * whose digest is due later, with when.
 */
export async function noticeLeads(
  alertId: string,
  transaction: Transaction,
  at?: Date,
): Promise<{ leadId: string; dueAt: Date }[]> {
  const leads = await select<Lead>(
    `SELECT id, email FROM users WHERE role = 'lead' AND is_active ORDER BY id`,
    { transaction },
  )
  if (!leads.length) logger.warn({ alertId }, 'alert raised, but there is no active lead to e-mail')
  const later: { leadId: string; dueAt: Date }[] = []
  const now = at ?? new Date()
  for (const lead of leads) {
    await lockLead(lead.id, transaction)
    await execute(
      `INSERT INTO alert_notices (alert_id, user_id, created_at) VALUES (:alertId, :leadId, :now)
       ON CONFLICT DO NOTHING`,
      { replacements: { alertId, leadId: lead.id, now }, transaction },
    )
    const { dueAt } = await mailLead(lead, now, transaction)
    if (dueAt) later.push({ leadId: lead.id, dueAt })
  }
  return later
}

/**
 * Sends the digest of every lead whose window is over at `now` and who has alerts waiting.
 * Returns how many e-mails it queued and the leads still waiting, with when they are due.
 */
export async function sendDueDigests(
  now = new Date(),
): Promise<{ sent: number; later: { leadId: string; dueAt: Date }[] }> {
  const leads = await select<Lead>(
    `SELECT DISTINCT u.id, u.email FROM alert_notices n JOIN users u ON u.id = n.user_id
      WHERE n.email_id IS NULL AND u.is_active ORDER BY u.id`,
  )
  let sent = 0
  const later: { leadId: string; dueAt: Date }[] = []
  for (const lead of leads) {
    const done = await withTransaction(async (transaction) => {
      await lockLead(lead.id, transaction)
      return mailLead(lead, now, transaction)
    })
    if (done.dueAt) later.push({ leadId: lead.id, dueAt: done.dueAt })
    if (done.isSent) sent++
  }
  return { sent, later }
}
