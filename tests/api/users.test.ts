import { describe, expect, it } from 'vitest'
import { TestClient, signedInRoles, uniqueSuffix } from './support/client'

describe('users', () => {
  const { admin } = signedInRoles('admin')

  it('creates a user who can then sign in with the given role', async () => {
    const email = `new-${uniqueSuffix()}@ferncastle.example`.toLowerCase()
    const res = await admin.post('/api/users', {
      email,
      name: 'New Person',
      role: 'operator',
      password: 'long-enough-1',
    })
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({ email, role: 'operator', isActive: true })
    const person = new TestClient()
    expect((await person.signIn(email, 'long-enough-1')).body.user.role).toBe('operator')
  })

  it('refuses a short password and a taken e-mail, naming the field', async () => {
    const short = await admin.post('/api/users', {
      email: 'x@ferncastle.example',
      name: 'X',
      role: 'lead',
      password: 'short',
    })
    expect(short.status).toBe(400)
    expect(short.body.fields.password).toMatch(/at least/)
    const taken = await admin.post('/api/users', {
      email: 'lead@ferncastle.example',
      name: 'Copy',
      role: 'lead',
      password: 'long-enough-1',
    })
    expect(taken.status).toBe(409)
    expect(taken.body.fields).toEqual({ email: 'already in use' })
  })

  it("ends a deactivated user's session at once", async () => {
    const email = `leaver-${uniqueSuffix()}@ferncastle.example`.toLowerCase()
    const created = await admin.post('/api/users', {
      email,
      name: 'Leaver',
      role: 'lead',
      password: 'long-enough-1',
    })
    const leaver = new TestClient()
    await leaver.signIn(email, 'long-enough-1')
    await leaver.get('/api/stations').expect(200)
    await admin.patch(`/api/users/${created.body.id}`, { isActive: false }).expect(200)
    await leaver.get('/api/stations').expect(401)
    expect((await new TestClient().signIn(email, 'long-enough-1')).status).toBe(401)
  })

  it('applies a role change on the next request', async () => {
    const email = `mover-${uniqueSuffix()}@ferncastle.example`.toLowerCase()
    const created = await admin.post('/api/users', {
      email,
      name: 'Mover',
      role: 'operator',
      password: 'long-enough-1',
    })
    const mover = new TestClient()
    await mover.signIn(email, 'long-enough-1')
    await mover.get('/api/users').expect(403)
    await admin.patch(`/api/users/${created.body.id}`, { role: 'admin' }).expect(200)
    await mover.get('/api/users').expect(200)
  })

  it('does not let an admin lock themself out', async () => {
    const me = await admin.get('/api/auth/me')
    const res = await admin.patch(`/api/users/${me.body.user.id}`, { isActive: false })
    expect(res.status).toBe(409)
  })
})
