import { beforeAll, describe, expect, it } from 'vitest'
import { AuditEvent } from '../../server/models'
import { SIGN_IN_LIMITS } from '../../server/middleware/rateLimits'
import { resetSignInLimits, TestClient, uniqueSuffix } from './support/client'

const sessionCookie = (res: { headers: Record<string, unknown> }) =>
  ((res.headers['set-cookie'] as string[] | undefined) ?? []).find((c) =>
    c.startsWith('waymark.sid='),
  )

describe('sign-in', () => {
  beforeAll(resetSignInLimits)

  it('signs in with the right password and answers /me', async () => {
    const c = new TestClient()
    await c.get('/api/auth/me').expect(401)
    const res = await c.signIn('lead@ferncastle.example')
    expect(res.status).toBe(200)
    expect(res.body.user).toMatchObject({ email: 'lead@ferncastle.example', role: 'lead' })
    expect(res.body.user.passwordHash).toBeUndefined()
    const me = await c.get('/api/auth/me').expect(200)
    expect(me.body.user.email).toBe('lead@ferncastle.example')
  })

  it('gives the same 401 text for a wrong e-mail and a wrong password', async () => {
    const c = new TestClient()
    const wrongPassword = await c.signIn('lead@ferncastle.example', 'not-the-password')
    const wrongEmail = await c.signIn(
      `nobody-${uniqueSuffix()}@ferncastle.example`,
      'not-the-password',
    )
    expect(wrongPassword.status).toBe(401)
    expect(wrongEmail.status).toBe(401)
    expect(wrongEmail.body).toEqual(wrongPassword.body)
  })

  it('regenerates the session id at sign-in and sets a httpOnly, SameSite=Lax cookie', async () => {
    const c = new TestClient()
    const first = await c.agent.get('/api/auth/csrf')
    const before = sessionCookie(first)
    c.csrf = first.body.csrfToken
    const res = await c.post('/api/auth/login', {
      email: 'operator@ferncastle.example',
      password: 'waymark-demo',
    })
    expect(res.status).toBe(200)
    const after = sessionCookie(res)
    expect(before).toBeDefined()
    expect(after).toBeDefined()
    expect(after!.split(';')[0]).not.toBe(before!.split(';')[0])
    expect(after).toMatch(/HttpOnly/i)
    expect(after).toMatch(/SameSite=Lax/i)
    expect(after).not.toMatch(/Secure/i) // Secure only when NODE_ENV=production
  })

  it('refuses a state change without the CSRF token with 403', async () => {
    const c = new TestClient()
    const res = await c.agent
      .post('/api/auth/login')
      .send({ email: 'lead@ferncastle.example', password: 'waymark-demo' })
    expect(res.status).toBe(403)
    expect(res.body.error).toBe('csrf_invalid')
  })

  it('names the bad field when the sign-in body is invalid', async () => {
    const c = new TestClient()
    await c.refreshCsrf()
    const res = await c.post('/api/auth/login', { email: 'not-an-email', password: '' })
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.fields)).toEqual(expect.arrayContaining(['email', 'password']))
  })

  it('signs out and the session no longer works', async () => {
    const c = new TestClient()
    await c.signIn('service@ferncastle.example')
    await c.post('/api/auth/logout').expect(204)
    await c.get('/api/auth/me').expect(401)
  })

  it('audits sign-in successes and failures', async () => {
    const c = new TestClient()
    const email = 'stores@ferncastle.example'
    const since = new Date()
    await c.signIn(email, 'wrong-one')
    await c.signIn(email)
    const events = await AuditEvent.findAll({
      where: { actorEmail: email },
      order: [['id', 'ASC']],
    })
    const recent = events
      .filter((e) => e.at >= new Date(since.getTime() - 1000))
      .map((e) => e.action)
    expect(recent).toEqual(expect.arrayContaining(['auth.sign_in_failed', 'auth.sign_in']))
  })

  it(
    'rate-limits failed sign-ins per account, then refuses even the right password',
    { timeout: 120_000 },
    async () => {
      await resetSignInLimits()
      const c = new TestClient()
      const email = 'engineer@ferncastle.example'
      for (let i = 0; i < SIGN_IN_LIMITS.perAccount; i++)
        expect((await c.signIn(email, `guess-${i}`)).status).toBe(401)
      const blocked = await c.signIn(email)
      expect(blocked.status).toBe(429)
      expect(blocked.body.error).toBe('too_many_attempts')
      await resetSignInLimits()
    },
  )

  it('rate-limits failed sign-ins per address across accounts', { timeout: 240_000 }, async () => {
    await resetSignInLimits()
    const c = new TestClient()
    let last = 0
    for (let i = 0; i <= SIGN_IN_LIMITS.perIp; i++)
      last = (await c.signIn(`nobody-${i}-${uniqueSuffix()}@ferncastle.example`, 'x')).status
    expect(last).toBe(429)
    await resetSignInLimits()
  })
})
