import { randomUUID } from 'node:crypto'
import { Op } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { AlertDto } from '../../shared/schemas/alerts'
import type { LotDto, UnitSummaryDto } from '../../shared/schemas/lots'
import type { RevisionDto } from '../../shared/schemas/recipes'
import { AuditEvent, Email, User } from '../../server/models'
import {
  alertJobKey,
  alertsQueue,
  closeAlertsQueue,
} from '../../server/services/quality/alertQueue'
import { processAlertJob } from '../../server/services/quality'
import { resetSignInLimits, signedInAs, uniqueSuffix } from './support/client'
import type { TestClient } from './support/client'
import { loadTestRun, windingRun } from './support/floor'
import type { TestLot } from './support/floor'
import { startMailRig } from './support/mailRig'
import { buildSmallRecipe } from './support/recipes'

let engineer: TestClient
let lead: TestClient
let stores: TestClient
let operator: TestClient
let defectId: string
let mailRig: Awaited<ReturnType<typeof startMailRig>>

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
  const rev = (await engineer.post(`/api/revisions/${draft.id}/release`).expect(200))
    .body as RevisionDto
  const created = await lead
    .post('/api/lots', { revisionId: rev.id, quantity, orderRef: `PO-${uniqueSuffix()}` })
    .expect(201)
  const lot = (await lead.post(`/api/lots/${created.body.id}/release`).expect(200)).body as LotDto
  const units = (await lead.get(`/api/lots/${lot.id}/units`).expect(200)).body as UnitSummaryDto[]
  const cl = await stores
    .post('/api/component-lots', {
      partId: rev.bom[0]!.partId,
      supplierName: 'Test',
      supplierLotCode: `S-${uniqueSuffix()}`,
      quantityReceived: 100,
      receivedOn: '2026-11-01',
    })
    .expect(201)
  return { rev, lot, units, componentLotCode: cl.body.internalCode }
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

/** E-mails the fake SMTP server filed whose subject starts with `prefix`, once `count` arrived. */
async function received(prefix: string, count: number): Promise<Email[]> {
  const deadline = Date.now() + 15_000
  for (;;) {
    const rows = await Email.findAll({
      where: { status: 'received', subject: { [Op.startsWith]: prefix } },
    })
    if (rows.length >= count || Date.now() > deadline) return rows
    await new Promise((r) => setTimeout(r, 100))
  }
}

/** Waits for every queued e-mail about these alerts to leave the outbox. */
async function drained(alertIds: string[]): Promise<void> {
  const deadline = Date.now() + 15_000
  while (
    (await Email.count({ where: { relatedId: alertIds, status: 'queued' } })) > 0 &&
    Date.now() < deadline
  )
    await new Promise((r) => setTimeout(r, 100))
}

beforeAll(async () => {
  await resetSignInLimits()
  ;[engineer, lead, stores, operator] = await Promise.all(
    ['engineer', 'lead', 'stores', 'operator'].map(signedInAs),
  )
  defectId = (await operator.get('/api/defect-codes')).body.find(
    (d: { code: string }) => d.code === 'L-VOUT',
  ).id
  mailRig = await startMailRig()
})

afterAll(() => mailRig.stop(closeAlertsQueue))

describe('quality alerts', () => {
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

  it('e-mails the leads exactly once when a step falls below the FPY threshold', async () => {
    const t = await alertLot(12)
    const loadStep = t.rev.steps[1]!
    const job = { lotId: t.lot.id, stepId: loadStep.id }
    for (const u of t.units) await wind(t, u.serial, 25.39)
    // Two failures in the first nine: 7 / 9 is below 90 %, but fewer than 10 first attempts.
    for (const [i, u] of t.units.slice(0, 9).entries()) await loadTest(u.serial, i >= 2)
    expect(await processAlertJob(job)).toEqual({ raised: 0 })
    // The tenth passes: 8 / 10 = 80 % (arithmetic) is below the default 90 %.
    await loadTest(t.units[9]!.serial, true)
    expect(await processAlertJob(job)).toEqual({ raised: 1 })

    const [alert, ...others] = await lotAlerts(t.lot.id)
    expect(others).toEqual([])
    expect(alert).toMatchObject({
      lotNumber: t.lot.number,
      stepName: 'Load test',
      rule: 'fpy_below_threshold',
      checkId: null,
      status: 'open',
      details: { kind: 'fpy', passedFirst: 8, firstAttempts: 10, fpy: 0.8, thresholdPercent: 90 },
      headline: 'First-pass yield 80.0 % is below 90 % (8 of 10 first attempts passed)',
    })

    // More failures and more evaluations, two of them at once: nothing new is stored or sent.
    await loadTest(t.units[10]!.serial, false)
    await loadTest(t.units[11]!.serial, false)
    const again = await Promise.all([processAlertJob(job), processAlertJob(job)])
    expect(again).toEqual([{ raised: 0 }, { raised: 0 }])
    expect(await processAlertJob(job)).toEqual({ raised: 0 })
    // The winding step: every unit passed, all values equal, so no alert of any kind there.
    expect(await processAlertJob({ lotId: t.lot.id, stepId: t.rev.steps[0]!.id })).toEqual({
      raised: 0,
    })
    expect(await lotAlerts(t.lot.id)).toHaveLength(1)

    await drained([alert!.id])
    const prefix = `Quality alert: lot ${t.lot.number},`
    const mails = await received(prefix, 1)
    expect(mails).toHaveLength(1)
    const [message] = mails
    expect(message!.subject).toBe(
      `Quality alert: lot ${t.lot.number}, Load test: FPY 80.0 % below 90 %`,
    )
    const leads = await User.findAll({ where: { role: 'lead', isActive: true } })
    expect([...message!.toAddresses].sort()).toEqual(leads.map((u) => u.email).sort())
    expect(message!.textBody).toContain('8 of 10 units passed at their first attempt')
    expect(message!.textBody).toMatch(new RegExp(`/lots/${t.lot.id}`))
    // The outbox holds one e-mail for the alert, and the fake filed one copy of it.
    expect(await Email.count({ where: { relatedEntity: 'alert', relatedId: alert!.id } })).toBe(1)
    expect(await AuditEvent.count({ where: { action: 'alert.raise', entityId: alert!.id } })).toBe(
      1,
    )
  })

  it("judges a step against its own revision's threshold", async () => {
    const t = await alertLot(11, { thresholdPercent: 75 })
    const job = { lotId: t.lot.id, stepId: t.rev.steps[1]!.id }
    for (const u of t.units) await wind(t, u.serial, 25.39)
    for (const [i, u] of t.units.slice(0, 10).entries()) await loadTest(u.serial, i >= 2)
    // 8 / 10 = 80 % is not below 75 %.
    expect(await processAlertJob(job)).toEqual({ raised: 0 })
    await loadTest(t.units[10]!.serial, false)
    // 8 / 11 = 72.7 % is below 75 %.
    expect(await processAlertJob(job)).toEqual({ raised: 1 })
    const [alert] = await lotAlerts(t.lot.id)
    expect(alert!.details).toMatchObject({
      passedFirst: 8,
      firstAttempts: 11,
      thresholdPercent: 75,
    })
  })

  it('raises a run-rule alert on a winding check once, with the centre and sigma it used', async () => {
    const t = await alertLot(10, { inductanceNominal: 25.1 })
    const windStep = t.rev.steps[0]!
    const job = { lotId: t.lot.id, stepId: windStep.id }
    // Constructed, as in the unit test of runRuleBreaches: 25.0 and 25.2 mH alternate (0.1 from
    // the nominal 25.1), then 26.0 mH. Moving ranges 0.2 × 7 and 0.8: MR̄ = 2.2 / 8 = 0.275,
    // σ = 0.275 / 1.128 = 0.2438 mH, 3σ = 0.731 mH; 26.0 is 0.9 above the nominal: rule 1.
    const values = [25, 25.2, 25, 25.2, 25, 25.2, 25, 25.2]
    for (const [i, v] of values.entries()) await wind(t, t.units[i]!.serial, v)
    expect(await processAlertJob(job)).toEqual({ raised: 0 })
    await wind(t, t.units[8]!.serial, 26) // inside the 19–32 mH limits: the unit passes
    const first = await processAlertJob(job)
    expect(first.raised).toBeGreaterThanOrEqual(1)

    const inductance = (await lotAlerts(t.lot.id)).filter((a) => a.checkLabel === 'Inductance')
    expect(inductance).toHaveLength(1)
    expect(inductance[0]).toMatchObject({
      rule: 'run_rule_1',
      stepName: 'Winding',
      checkUnit: 'mH',
      details: {
        kind: 'run_rule',
        rule: 1,
        centre: 25.1,
        centreSource: 'nominal',
        points: 9,
        index: 8,
        serial: t.units[8]!.serial,
        value: 26,
      },
    })
    expect((inductance[0]!.details as { sigma: number }).sigma).toBeCloseTo(0.275 / 1.128, 9)

    // A tenth unit and two more evaluations: every alert stays stored and sent once.
    await wind(t, t.units[9]!.serial, 25.1)
    expect(await processAlertJob(job)).toEqual({ raised: 0 })
    expect(await processAlertJob(job)).toEqual({ raised: 0 })
    const all = await lotAlerts(t.lot.id)
    expect(all).toHaveLength(first.raised)
    await drained(all.map((a) => a.id))
    const subject = `Quality alert: lot ${t.lot.number}, Winding: Inductance broke run rule 1`
    const mails = await received(subject, 1)
    expect(mails).toHaveLength(1)
    expect(mails[0]!.subject).toBe(subject)
    expect(mails[0]!.textBody).toContain("centre 25.1 mH (the check's nominal)")
    expect(mails[0]!.textBody).toContain('average moving range')
    // One e-mail per alert, whatever the derived turn-deviation check tripped as well.
    expect(await received(`Quality alert: lot ${t.lot.number},`, all.length)).toHaveLength(
      all.length,
    )
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
})
