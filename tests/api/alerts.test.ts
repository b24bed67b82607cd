import { randomUUID } from 'node:crypto'
import type { Redis } from 'ioredis'
import { Op } from 'sequelize'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import type { AlertDto } from '../../shared/schemas/alerts'
import type { RevisionDto } from '../../shared/schemas/recipes'
import { startSmtpFake } from '../../server/devMail/smtpFake'
import { closeMail, setSmtpPortForTests } from '../../server/mail'
import { AuditEvent, db, Email, User } from '../../server/models'
import {
  alertJobKey,
  alertsQueue,
  closeAlertsQueue,
} from '../../server/services/quality/alertQueue'
import { closeMailQueue } from '../../server/services/mail/queue'
import { newQueueConnection } from '../../server/redis'
import { processAlertJob, sendDueDigests } from '../../server/services/quality'
import { enqueueMail, startMailWorker } from '../../server/services/mail'
import { LOT_ROLES, signedInRoles } from './support/client'
import { loadTestRun, releasedLotOf, windingRun } from './support/floor'
import type { TestLot } from './support/floor'
import { buildSmallRecipe } from './support/recipes'

const { engineer, lead, stores, operator } = signedInRoles(...LOT_ROLES)
let defectId: string
let fake: Awaited<ReturnType<typeof startSmtpFake>>
let connection: Redis
let mail: ReturnType<typeof startMailWorker>

/**
 * A released lot of the small test recipe (winding with an inductance check and its derived
 * turn deviation, then load test), with the revision's FPY threshold and the inductance
 * check's nominal set first when given.
 */
async function alertLot(
  quantity: number,
  opts: { thresholdPercent?: number; inductanceNominal?: number } = {},
): Promise<TestLot> {
  const draft = await buildSmallRecipe(engineer)
  if (opts.thresholdPercent !== undefined)
    await engineer
      .patch(`/api/revisions/${draft.id}`, { fpyThresholdPercent: opts.thresholdPercent })
      .expect(200)
  if (opts.inductanceNominal !== undefined) {
    const check = draft.steps[0]!.checks.find((c) => c.key === 'l_sec')!
    await engineer.patch(`/api/checks/${check.id}`, { nominal: opts.inductanceNominal }).expect(200)
  }
  return releasedLotOf({ engineer, lead, stores }, draft, quantity)
}

async function wind(t: TestLot, serial: string, inductanceMilliHenry: number) {
  await operator
    .post('/api/step-runs', windingRun(t, serial, { values: { l_sec: inductanceMilliHenry } }))
    .expect(201)
}

/** A load test: 350 V passes (limits 345–355 V), 340 V fails. */
async function loadTest(serial: string, isPass: boolean) {
  const body = isPass
    ? loadTestRun(serial, 350)
    : loadTestRun(serial, 340, { defectCodeId: defectId })
  await operator.post('/api/step-runs', body).expect(201)
}

async function lotAlerts(lotId: string, query = ''): Promise<AlertDto[]> {
  return (await lead.get(`/api/alerts?lotId=${lotId}${query}`).expect(200)).body as AlertDto[]
}

/** Active leads: each is told of each alert once. */
async function leadCount(): Promise<number> {
  return User.count({ where: { role: 'lead', isActive: true } })
}

/**
 * Alert e-mails (single or digest) the app queued whose subject starts with `prefix`, once
 * `count` of them carry the mail fake's delivery receipt (it filed its copy).
 */
async function delivered(prefix: string, count: number): Promise<Email[]> {
  const deadline = Date.now() + 30_000
  for (;;) {
    // A job Redis did not take in time on a busy machine: enqueue it again (the id dedupes).
    const waiting = await Email.findAll({
      where: { subject: { [Op.startsWith]: prefix }, status: 'queued' },
    })
    for (const e of waiting) await enqueueMail(e.id)
    const rows = await Email.findAll({
      where: { subject: { [Op.startsWith]: prefix }, receiptAt: { [Op.ne]: null } },
    })
    if (rows.length >= count || Date.now() > deadline) return rows
    await new Promise((r) => setTimeout(r, 100))
  }
}

/** E-mails the app queued with a subject starting with `prefix`, in any state. */
async function queuedMails(prefix: string): Promise<Email[]> {
  return Email.findAll({
    where: { subject: { [Op.startsWith]: prefix }, status: { [Op.ne]: 'received' } },
  })
}

/**
 * The leads' last alert e-mail was two hours ago: the digest window is over for every lead, and
 * what waited for a digest (alerts of other tests or files) goes out now, so a test starts clean.
 */
async function windowOver(): Promise<void> {
  await ageNotices()
  await sendDueDigests()
  await ageNotices()
}

/**
 * Moves the notices of alerts raised since the demo was loaded two hours back. The demo's own
 * alerts (raised in its past, before its anchor) keep their story times, which demo.test.ts
 * checks while this file runs beside it.
 */
async function ageNotices(): Promise<void> {
  await db().query(
    `UPDATE alert_notices SET mailed_at = mailed_at - interval '2 hours'
      WHERE mailed_at IS NOT NULL
        AND alert_id IN (
          SELECT id FROM alerts WHERE created_at >= COALESCE(
            (SELECT (after->>'anchor')::timestamptz FROM audit_events
              WHERE action = 'demo.load' ORDER BY id DESC LIMIT 1),
            '-infinity'))`,
  )
}

beforeAll(async () => {
  defectId = (await operator.get('/api/defect-codes')).body.find(
    (d: { code: string }) => d.code === 'L-VOUT',
  ).id
  fake = await startSmtpFake({ port: 0 })
  setSmtpPortForTests(fake.port)
  connection = newQueueConnection()
  mail = startMailWorker(connection)
})

beforeEach(windowOver)

afterAll(async () => {
  mail.stop()
  await mail.worker.close()
  await closeMailQueue()
  await closeAlertsQueue()
  await connection.quit()
  closeMail()
  await fake.close()
})

// Each test runs many scans and waits for mail to pass through a real queue: room for a busy machine.
describe('quality alerts', { timeout: 90_000 }, () => {
  it('takes the FPY threshold from the draft revision, frozen on release, carried by a copy', async () => {
    const draft = await buildSmallRecipe(engineer)
    expect(draft.fpyThresholdPercent).toBe(90) // the default
    const bad = await engineer.patch(`/api/revisions/${draft.id}`, { fpyThresholdPercent: 101 })
    expect(bad.status).toBe(400)
    expect(bad.body.fields).toHaveProperty('fpyThresholdPercent')
    await engineer.patch(`/api/revisions/${draft.id}`, { fpyThresholdPercent: 82.5 }).expect(200)
    await engineer.post(`/api/revisions/${draft.id}/release`).expect(200)
    const frozen = await engineer.patch(`/api/revisions/${draft.id}`, { fpyThresholdPercent: 50 })
    expect(frozen.status).toBe(409)
    expect(frozen.body.error).toBe('revision_frozen')
    const copy = (await engineer.post(`/api/revisions/${draft.id}/copy`).expect(201))
      .body as RevisionDto
    expect(copy.fpyThresholdPercent).toBe(82.5)
  })

  it('queues a re-evaluation of the lot and step after each new step run', async () => {
    const t = await alertLot(1)
    await wind(t, t.units[0]!.serial, 25.39)
    const key = alertJobKey(t.lot.id, t.rev.steps[0]!.id)
    // The hook runs after the answer is sent: give it a moment.
    const deadline = Date.now() + 5000
    let jobId: string | null = null
    while (!jobId && Date.now() < deadline) {
      jobId = await alertsQueue().getDeduplicationJobId(key)
      if (!jobId) await new Promise((r) => setTimeout(r, 50))
    }
    expect(jobId).not.toBeNull()
    const job = await alertsQueue().getJob(jobId!)
    expect(job?.data).toEqual({ lotId: t.lot.id, stepId: t.rev.steps[0]!.id })
  })

  it('raises one FPY episode, e-mails each lead once, and ends it back above the threshold', async () => {
    const t = await alertLot(14)
    const loadStep = t.rev.steps[1]!
    const job = { lotId: t.lot.id, stepId: loadStep.id }
    for (const u of t.units) await wind(t, u.serial, 25.39)
    // Two failures in the first nine: 7 / 9 is below 90 %, but fewer than 10 first attempts.
    for (const [i, u] of t.units.slice(0, 9).entries()) await loadTest(u.serial, i >= 2)
    expect(await processAlertJob(job)).toEqual({ raised: 0, ended: 0 })
    // The tenth passes: 8 / 10 = 80 % (arithmetic) is below the default 90 %.
    await loadTest(t.units[9]!.serial, true)
    expect(await processAlertJob(job)).toEqual({ raised: 1, ended: 0 })

    const [alert, ...others] = await lotAlerts(t.lot.id)
    expect(others).toEqual([])
    expect(alert).toMatchObject({
      lotNumber: t.lot.number,
      stepName: 'Load test',
      rule: 'fpy_below_threshold',
      rules: ['fpy_below_threshold'],
      checkId: null,
      status: 'open',
      isBackInControl: false,
      details: { kind: 'fpy', passedFirst: 8, firstAttempts: 10, fpy: 0.8, thresholdPercent: 90 },
      headline: 'First-pass yield 80.0 % is below 90 % (8 of 10 first attempts passed)',
    })
    // Every failure was at the one load-test rack: the plain words name it.
    expect(alert!.summary).toMatch(/^Load-test rack 1: first-pass yield 80\.0 % \(8 of 10/)

    // More failures and more evaluations, two of them at once: nothing new is stored or sent.
    await loadTest(t.units[10]!.serial, false)
    const again = await Promise.all([processAlertJob(job), processAlertJob(job)])
    expect(again).toEqual([
      { raised: 0, ended: 0 },
      { raised: 0, ended: 0 },
    ])
    // The winding step: every value equal, so no spread and no run-rule alert there.
    expect(await processAlertJob({ lotId: t.lot.id, stepId: t.rev.steps[0]!.id })).toEqual({
      raised: 0,
      ended: 0,
    })
    expect(await lotAlerts(t.lot.id)).toHaveLength(1)
    // The running episode keeps its figures current: 8 of 11.
    expect((await lotAlerts(t.lot.id))[0]!.details).toMatchObject({ firstAttempts: 11 })

    const prefix = `Quality alert: lot ${t.lot.number},`
    const leads = await leadCount()
    const mails = await delivered(prefix, leads)
    expect(mails).toHaveLength(leads)
    expect(mails[0]!.subject).toBe(
      `Quality alert: lot ${t.lot.number}, Load test: FPY 80.0 % below 90 %`,
    )
    const leadMails = await User.findAll({ where: { role: 'lead', isActive: true } })
    expect(mails.map((m) => m.toAddresses[0]).sort()).toEqual(leadMails.map((u) => u.email).sort())
    expect(mails[0]!.textBody.split('\n')[1]).toBe(alert!.summary)
    expect(mails[0]!.textBody).toContain('8 of 10 units passed at their first attempt')
    expect(mails[0]!.textBody).toMatch(new RegExp(`/lots/${t.lot.id}`))
    // The fake filed no row of its own for mail the app sent: each message shows once.
    expect(
      await Email.count({ where: { status: 'received', subject: { [Op.startsWith]: prefix } } }),
    ).toBe(0)
    expect(await AuditEvent.count({ where: { action: 'alert.raise', entityId: alert!.id } })).toBe(
      1,
    )

    // Three passes: 11 / 14 = 78.6 % is still below; then the threshold drops below that. The
    // episode ends only when the step is back at or above the threshold.
    for (const u of t.units.slice(11, 14)) await loadTest(u.serial, true)
    expect(await processAlertJob(job)).toEqual({ raised: 0, ended: 0 })
    // The threshold is frozen on a released revision; the test moves it to see the episode end.
    await db().query(`UPDATE revisions SET fpy_threshold_percent = 75 WHERE id = :id`, {
      replacements: { id: t.rev.id },
    })
    expect(await processAlertJob(job)).toEqual({ raised: 0, ended: 1 })
    const [ended] = await lotAlerts(t.lot.id)
    expect(ended).toMatchObject({ isBackInControl: true, status: 'open' })
    expect(
      await AuditEvent.count({ where: { action: 'alert.back_in_control', entityId: alert!.id } }),
    ).toBe(1)
    expect(await queuedMails(prefix)).toHaveLength(leads)
  })

  it("judges a step against its own revision's threshold", async () => {
    const t = await alertLot(11, { thresholdPercent: 75 })
    const job = { lotId: t.lot.id, stepId: t.rev.steps[1]!.id }
    for (const u of t.units) await wind(t, u.serial, 25.39)
    for (const [i, u] of t.units.slice(0, 10).entries()) await loadTest(u.serial, i >= 2)
    // 8 / 10 = 80 % is not below 75 %.
    expect(await processAlertJob(job)).toEqual({ raised: 0, ended: 0 })
    await loadTest(t.units[10]!.serial, false)
    // 8 / 11 = 72.7 % is below 75 %.
    expect(await processAlertJob(job)).toEqual({ raised: 1, ended: 0 })
    const [alert] = await lotAlerts(t.lot.id)
    expect(alert!.details).toMatchObject({
      passedFirst: 8,
      firstAttempts: 11,
      thresholdPercent: 75,
    })
  })

  it('raises one alert per run-rule episode, listing every rule, and re-arms once back in control', async () => {
    const t = await alertLot(30, { inductanceNominal: 25.1 })
    const windStep = t.rev.steps[0]!
    const job = { lotId: t.lot.id, stepId: windStep.id }
    // Constructed: 25.0 and 25.2 mH alternate at WND-1, then four units read 27.5 mH at WND-2
    // (about 3.7 turns over 92 by N = √(L/AL), AL 3000 nH/turn²), then ten calm ones, then
    // three at 27.5 mH again. The inductance and its derived deviation are one series, judged
    // on the deviation against the lot median (the core's AL tolerance, DESIGN.md §7).
    const calm = [25, 25.2, 25, 25.2, 25, 25.2, 25, 25.2, 25, 25.2]
    let next = 0
    const windAll = async (values: number[], station = 'WND-1') => {
      for (const v of values)
        await operator
          .post(
            '/api/step-runs',
            windingRun(t, t.units[next++]!.serial, { values: { l_sec: v }, stationCode: station }),
          )
          .expect(201)
    }
    await windAll(calm)
    expect(await processAlertJob(job)).toEqual({ raised: 0, ended: 0 })
    await windAll([27.5, 27.5], 'WND-2')
    expect(await processAlertJob(job)).toEqual({ raised: 1, ended: 0 })
    await windAll([27.5, 27.5], 'WND-2')
    // More points of the same episode: the alert grows, nothing new is raised or sent.
    expect(await processAlertJob(job)).toEqual({ raised: 0, ended: 0 })
    const [first, ...more] = await lotAlerts(t.lot.id)
    expect(more).toEqual([])
    expect(first).toMatchObject({
      stepName: 'Winding',
      checkLabel: 'Deviation',
      checkUnit: 'turns',
      isBackInControl: false,
      details: { kind: 'run_rule', centreSource: 'lot_median', start: 10, points: 14 },
    })
    // Rule 1 (each 27.5 mH point beyond 3σ) and rule 2 (2 of 3 beyond 2σ) at least, in one alert.
    expect(first!.rules).toEqual(expect.arrayContaining(['run_rule_1', 'run_rule_2']))
    expect(first!.summary).toMatch(
      /^Winding bench 2: 4 of the last 8 units read about 4\.1 turns over on Deviation( \(all by [^)]+\))?; check the turn counter/,
    )
    const prefix = `Quality alert: lot ${t.lot.number}, Winding:`
    const leads = await leadCount()
    expect(await delivered(prefix, leads)).toHaveLength(leads)

    // Ten calm units: back in control once 8 points in a row break no rule.
    await windAll(calm)
    expect(await processAlertJob(job)).toEqual({ raised: 0, ended: 1 })
    expect((await lotAlerts(t.lot.id))[0]!.isBackInControl).toBe(true)
    expect(await processAlertJob(job)).toEqual({ raised: 0, ended: 0 })

    // An hour later, out of control again: a new episode, a new alert and a new e-mail.
    await windowOver()
    await windAll([27.5, 27.5, 27.5], 'WND-2')
    expect(await processAlertJob(job)).toEqual({ raised: 1, ended: 0 })
    const all = await lotAlerts(t.lot.id)
    expect(all).toHaveLength(2)
    expect(all.filter((a) => !a.isBackInControl)).toHaveLength(1)
    expect(await delivered(prefix, 2 * leads)).toHaveLength(2 * leads)
    expect(await queuedMails(prefix)).toHaveLength(2 * leads)
  })

  it('says "not enough variation to judge" of a series with no spread, and raises nothing', async () => {
    const t = await alertLot(10, { inductanceNominal: 25.1 })
    for (const u of t.units) await wind(t, u.serial, 26)
    expect(await processAlertJob({ lotId: t.lot.id, stepId: t.rev.steps[0]!.id })).toEqual({
      raised: 0,
      ended: 0,
    })
    expect(await lotAlerts(t.lot.id)).toEqual([])
    const turns = (await lead.get(`/api/yield/lots/${t.lot.id}/turns`).expect(200)).body as {
      windings: { medianChart: { judgement: string; judgementText: string | null } | null }[]
    }
    expect(turns.windings[0]!.medianChart).toMatchObject({
      judgement: 'no_spread',
      judgementText: 'not enough variation to judge',
    })
  })

  it('e-mails each lead at most once per window, gathering later alerts into one digest', async () => {
    const leads = await leadCount()
    const lots = await Promise.all([1, 2, 3].map(() => alertLot(10)))
    const failAll = async (t: TestLot) => {
      for (const u of t.units) await wind(t, u.serial, 25.39)
      for (const [i, u] of t.units.entries()) await loadTest(u.serial, i >= 3)
      return processAlertJob({ lotId: t.lot.id, stepId: t.rev.steps[1]!.id })
    }
    // The first alert goes out at once.
    expect(await failAll(lots[0]!)).toEqual({ raised: 1, ended: 0 })
    const first = `Quality alert: lot ${lots[0]!.lot.number},`
    expect(await queuedMails(first)).toHaveLength(leads)
    // Two more within the window: stored, waiting for the digest, no e-mail yet.
    expect(await failAll(lots[1]!)).toEqual({ raised: 1, ended: 0 })
    expect(await failAll(lots[2]!)).toEqual({ raised: 1, ended: 0 })
    expect(await queuedMails(`Quality alert: lot ${lots[1]!.lot.number},`)).toEqual([])
    expect(await queuedMails(`Quality alert: lot ${lots[2]!.lot.number},`)).toEqual([])
    const aboutLot1 = async () =>
      (await queuedMails('Quality alerts:')).filter((m) => m.textBody.includes(lots[1]!.lot.number))
    expect(await aboutLot1()).toEqual([])
    // Before the window is over nothing goes; after it, one digest per lead with both.
    const before = await sendDueDigests(new Date(Date.now() + 59 * 60_000))
    expect(before.sent).toBe(0)
    expect(before.later.length).toBeGreaterThanOrEqual(leads)
    const after = await sendDueDigests(new Date(Date.now() + 61 * 60_000))
    expect(after.sent).toBeGreaterThanOrEqual(leads)
    const digests = await aboutLot1()
    expect(digests.map((m) => m.subject)).toEqual(
      Array.from({ length: leads }, () => 'Quality alerts: 2 new episodes on 2 lots'),
    )
    expect(digests).toHaveLength(leads)
    expect(digests[0]!.textBody).toContain(lots[2]!.lot.number)
    expect(digests[0]!.textBody).toContain('at most one such digest every 60 minutes')
    // Sending again sends nothing: each alert is in one message per lead.
    expect((await sendDueDigests(new Date(Date.now() + 200 * 60_000))).sent).toBe(0)
    const receipted = async () =>
      (await delivered('Quality alerts:', 1)).filter((m) =>
        m.textBody.includes(lots[1]!.lot.number),
      )
    await expect.poll(async () => (await receipted()).length, { timeout: 30_000 }).toBe(leads)
  })

  it('lets a lead acknowledge an alert once, audited; others may only read', async () => {
    const t = await alertLot(10)
    for (const u of t.units) await wind(t, u.serial, 25.39)
    for (const [i, u] of t.units.entries()) await loadTest(u.serial, i >= 2)
    await processAlertJob({ lotId: t.lot.id, stepId: t.rev.steps[1]!.id })
    const [alert] = await lotAlerts(t.lot.id, '&status=open')
    expect(alert).toBeDefined()

    await engineer.get(`/api/alerts?lotId=${t.lot.id}`).expect(200)
    // Without a lot: every lot's alerts, the open ones first.
    const everyLot = (await lead.get('/api/alerts').expect(200)).body as AlertDto[]
    expect(everyLot.map((a) => a.id)).toContain(alert!.id)
    const firstDone = everyLot.findIndex((a) => a.status === 'acknowledged')
    if (firstDone >= 0)
      expect(everyLot.slice(firstDone).every((a) => a.status !== 'open')).toBe(true)
    await engineer.post(`/api/alerts/${alert!.id}/acknowledge`).expect(403)
    await operator.get(`/api/alerts?lotId=${t.lot.id}`).expect(403)

    const me = (await lead.get('/api/auth/me').expect(200)).body as {
      user: { id: string; name: string }
    }
    const done = (await lead.post(`/api/alerts/${alert!.id}/acknowledge`).expect(200))
      .body as AlertDto
    expect(done).toMatchObject({
      id: alert!.id,
      status: 'acknowledged',
      acknowledgedBy: { id: me.user.id, name: me.user.name },
    })
    expect(done.acknowledgedAt).not.toBeNull()
    const audit = await AuditEvent.findAll({
      where: { action: 'alert.acknowledge', entityId: alert!.id },
    })
    expect(audit).toHaveLength(1)
    expect(audit[0]).toMatchObject({ actorId: me.user.id, after: { status: 'acknowledged' } })

    const twice = await lead.post(`/api/alerts/${alert!.id}/acknowledge`).expect(409)
    expect(twice.body.error).toBe('alert_acknowledged')
    expect(twice.body.message).toContain(me.user.name)
    expect(await lotAlerts(t.lot.id, '&status=open')).toEqual([])
    expect(await lotAlerts(t.lot.id, '&status=acknowledged')).toHaveLength(1)

    await lead.post(`/api/alerts/${randomUUID()}/acknowledge`).expect(404)
    await lead.post('/api/alerts/not-an-id/acknowledge').expect(400)
    const bad = await lead.get('/api/alerts?status=closed').expect(400)
    expect(bad.body.message).toBe('status: open or acknowledged')
  })

  it('lets a lead acknowledge every open alert of a lot, or every one, one audit row each', async () => {
    const raiseFpy = async () => {
      const t = await alertLot(10)
      for (const u of t.units) await wind(t, u.serial, 25.39)
      for (const [i, u] of t.units.entries()) await loadTest(u.serial, i >= 2)
      await processAlertJob({ lotId: t.lot.id, stepId: t.rev.steps[1]!.id })
      return t
    }
    const [a, b] = [await raiseFpy(), await raiseFpy()]
    const [alertA] = await lotAlerts(a.lot.id, '&status=open')
    const [alertB] = await lotAlerts(b.lot.id, '&status=open')
    expect(alertA && alertB).toBeTruthy()

    await engineer.post('/api/alerts/acknowledge', { lotId: a.lot.id }).expect(403)
    const bad = await lead.post('/api/alerts/acknowledge', { lotId: 'lot-a' }).expect(400)
    expect(bad.body.fields).toHaveProperty('lotId')
    await lead.post('/api/alerts/acknowledge', { lotId: randomUUID() }).expect(404)
    expect(await lotAlerts(a.lot.id, '&status=open')).toHaveLength(1)

    const me = (await lead.get('/api/auth/me').expect(200)).body as { user: { id: string } }
    const lotDone = (await lead.post('/api/alerts/acknowledge', { lotId: a.lot.id }).expect(200))
      .body as { acknowledged: number; ids: string[] }
    expect(lotDone).toEqual({ acknowledged: 1, ids: [alertA!.id] })
    expect(await lotAlerts(a.lot.id, '&status=open')).toEqual([])
    expect(await lotAlerts(b.lot.id, '&status=open')).toHaveLength(1)
    expect(
      await AuditEvent.count({
        where: { action: 'alert.acknowledge', entityId: alertA!.id, actorId: me.user.id },
      }),
    ).toBe(1)

    // Every open alert, whichever lot: B's among them; A's is not acknowledged twice.
    const allDone = (await lead.post('/api/alerts/acknowledge', {}).expect(200)).body as {
      acknowledged: number
      ids: string[]
    }
    expect(allDone.ids).toContain(alertB!.id)
    expect(allDone.ids).not.toContain(alertA!.id)
    expect(allDone.acknowledged).toBe(allDone.ids.length)
    expect((await lead.get('/api/alerts?status=open').expect(200)).body).toEqual([])
    expect(
      await AuditEvent.count({ where: { action: 'alert.acknowledge', entityId: allDone.ids } }),
    ).toBe(allDone.ids.length)
    expect(
      await AuditEvent.count({ where: { action: 'alert.acknowledge', entityId: alertA!.id } }),
    ).toBe(1)
  })
})
