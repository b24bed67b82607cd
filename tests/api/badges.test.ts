import { describe, expect, it } from 'vitest'
import { PASSWORD_LIMITS } from '../../server/middleware/rateLimits'
import { AuditEvent, User } from '../../server/models'
import { BADGE_CODE_SHAPE } from '../../shared/links'
import {
  LOT_ROLES,
  resetSignInLimits,
  signedInRoles,
  TestClient,
  uniqueSuffix,
} from './support/client'
import { loadTestRun, releasedTestLot, windingRun } from './support/floor'

const PASSWORD = 'a-long-test-password'

/** A fresh engineer of our own, so badge and PIN changes touch no demo account. */
async function newEngineer(
  admin: TestClient,
): Promise<{ id: string; client: TestClient; name: string }> {
  const email = `badge-${uniqueSuffix()}@ferncastle.example`.toLowerCase()
  const name = `Badge Tester ${uniqueSuffix()}`
  const created = await admin
    .post('/api/users', { email, name, role: 'engineer', password: PASSWORD })
    .expect(201)
  const client = new TestClient()
  expect((await client.signIn(email, PASSWORD)).status).toBe(200)
  return { id: created.body.id, client, name }
}

const badgeOf = async (id: string) => (await User.findByPk(id))!.badgeCode!

describe('badge and PIN for a second signature', () => {
  const { admin, lead, operator, engineer, stores } = signedInRoles(...LOT_ROLES, 'admin')

  /** A unit that failed its load test, its nonconformance waiting for a decision. */
  async function nonconformanceToDispose(): Promise<string> {
    const t = await releasedTestLot({ engineer, lead, stores }, 1)
    const serial = t.units[0]!.serial
    await operator.post('/api/step-runs', windingRun(t, serial)).expect(201)
    const defectId = (await operator.get('/api/defect-codes')).body[0].id
    const failed = await operator.post(
      '/api/step-runs',
      loadTestRun(serial, 356, { defectCodeId: defectId }),
    )
    return failed.body.nonconformanceId as string
  }

  it('sets a PIN only with the person’s own password, hashed and audited without the value', async () => {
    const me = await newEngineer(admin)
    const wrong = await me.client.send('put', '/api/auth/pin', { password: 'nope', pin: '4711' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.fields).toHaveProperty('password')
    const short = await me.client.send('put', '/api/auth/pin', { password: PASSWORD, pin: '12' })
    expect(short.status).toBe(400)
    expect(short.body.fields).toHaveProperty('pin')
    await me.client.send('put', '/api/auth/pin', { password: PASSWORD, pin: '4711' }).expect(200)
    const user = (await User.findByPk(me.id))!
    expect(user.pinHash).toMatch(/^\$2[aby]\$/)
    const audit = await AuditEvent.findOne({ where: { action: 'user.pin', entityId: me.id } })
    expect(audit?.after).toEqual({ pin: 'set' })
    expect(JSON.stringify(audit?.after)).not.toContain('4711')
    const listed = (await admin.get('/api/users').expect(200)).body.find(
      (u: { id: string }) => u.id === me.id,
    )
    expect(listed).toMatchObject({ hasPin: true, hasBadge: false })
  })

  it('prints a card-size badge PDF; a reprint replaces the code, and only admins print others’', async () => {
    const me = await newEngineer(admin)
    const first = await admin.post(`/api/users/${me.id}/badge`).buffer(true).expect(200)
    expect(first.headers['content-type']).toBe('application/pdf')
    expect(first.body.subarray(0, 5).toString()).toBe('%PDF-')
    const code = await badgeOf(me.id)
    expect(code).toMatch(BADGE_CODE_SHAPE)
    await me.client.post('/api/auth/badge').expect(200)
    expect(await badgeOf(me.id)).not.toBe(code)
    await lead.post(`/api/users/${me.id}/badge`).expect(403)
    const audits = await AuditEvent.findAll({
      where: { action: 'user.badge', entityId: me.id },
      order: [['id', 'ASC']],
    })
    expect(audits.map((a) => a.after)).toEqual([{ badge: 'printed' }, { badge: 'replaced' }])
    expect(JSON.stringify(audits.map((a) => a.after))).not.toContain(code)
  })

  it('countersigns a use-as-is with a scanned badge and PIN; a wrong PIN is refused and audited', async () => {
    const me = await newEngineer(admin)
    await me.client.send('put', '/api/auth/pin', { password: PASSWORD, pin: '250913' }).expect(200)
    await admin.post(`/api/users/${me.id}/badge`).expect(200)
    const badge = await badgeOf(me.id)
    const nc = await nonconformanceToDispose()
    const reason = 'output 1 V over; customer accepts per deviation note'
    const dispose = (countersign: unknown) =>
      lead.post(`/api/nonconformances/${nc}/disposition`, {
        disposition: 'use_as_is',
        reason,
        countersign,
      })

    const noPin = await dispose({ badge: badge.toLowerCase() })
    expect(noPin.status).toBe(400)
    expect(JSON.stringify(noPin.body.fields)).toContain('pin')
    const notBadge = await dispose({ badge: 'CL-26-00001E', pin: '250913' })
    expect(notBadge.status).toBe(400)
    expect(JSON.stringify(notBadge.body.fields)).toContain('badge')
    const wrongPin = await dispose({ badge, pin: '250914' })
    expect(wrongPin.status).toBe(400)
    expect(wrongPin.body.fields.countersign).toBe('badge or PIN is wrong')
    const failed = await AuditEvent.findOne({
      where: { action: 'countersign.failed', entityId: me.id },
      order: [['id', 'DESC']],
    })
    expect(failed?.after).toMatchObject({ triedBadge: badge, reason: 'wrong_pin' })

    const ok = await dispose({ badge, pin: '250913' })
    expect(ok.status).toBe(200)
    expect(ok.body).toMatchObject({ disposition: 'use_as_is', countersignedBy: me.name })
  })

  it('slows PIN guessing on one badge like password guessing on one account', async () => {
    const me = await newEngineer(admin)
    await me.client.send('put', '/api/auth/pin', { password: PASSWORD, pin: '8080' }).expect(200)
    await admin.post(`/api/users/${me.id}/badge`).expect(200)
    const badge = await badgeOf(me.id)
    const nc = await nonconformanceToDispose()
    const dispose = (pin: string) =>
      lead.post(`/api/nonconformances/${nc}/disposition`, {
        disposition: 'use_as_is',
        reason: 'output 1 V over; customer accepts per deviation note',
        countersign: { badge, pin },
      })
    const statuses: number[] = []
    for (let i = 0; i <= PASSWORD_LIMITS.perAccount; i++)
      statuses.push((await dispose(String(1000 + i))).status)
    expect(statuses.slice(0, PASSWORD_LIMITS.perAccount).every((s) => s === 400)).toBe(true)
    expect(statuses.at(-1)).toBe(429)
    // Over the limit even the right PIN waits: the limit is per badge, not per answer.
    expect((await dispose('8080')).status).toBe(429)
    await resetSignInLimits()
  }, 120_000)
})
