import { describe, expect, it } from 'vitest'
import { AuditEvent } from '../../server/models'
import { signedInRoles, uniqueSuffix } from './support/client'

describe('stations', () => {
  const { admin, operator } = signedInRoles('admin', 'operator')

  it('lists the demo floor to any signed-in user', async () => {
    const res = await operator.get('/api/stations').expect(200)
    expect(res.body.map((s: { code: string }) => s.code)).toEqual(
      expect.arrayContaining(['WND-1', 'HPT-1']),
    )
  })

  it('creates a station, upper-cases its code and audits it', async () => {
    const code = `t-${uniqueSuffix()}`
    const res = await admin.post('/api/stations', { code, name: 'Test bench', kind: 'soldering' })
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({ code: code.toUpperCase(), kind: 'soldering', isActive: true })
    const audit = await AuditEvent.findOne({ where: { entity: 'station', entityId: res.body.id } })
    expect(audit?.action).toBe('station.create')
    expect(audit?.actorEmail).toBe('admin@ferncastle.example')
  })

  it('refuses bad input with 400 naming each field', async () => {
    const res = await admin.post('/api/stations', { code: 'x', name: '', kind: 'welding' })
    expect(res.status).toBe(400)
    expect(res.body.error).toBe('validation_failed')
    expect(Object.keys(res.body.fields).sort()).toEqual(['code', 'kind', 'name'])
    expect(res.body.message).toMatch(/^code: /)
  })

  it('refuses a duplicate code with 409 on the code field and keeps the first', async () => {
    const code = `D-${uniqueSuffix()}`
    await admin.post('/api/stations', { code, name: 'First', kind: 'hipot' }).expect(201)
    const res = await admin.post('/api/stations', { code, name: 'Second', kind: 'hipot' })
    expect(res.status).toBe(409)
    expect(res.body.fields).toEqual({ code: 'already in use' })
    const list = await admin.get('/api/stations')
    expect(
      list.body
        .filter((s: { code: string }) => s.code === code)
        .map((s: { name: string }) => s.name),
    ).toEqual(['First'])
  })

  it('edits a station and audits the changed fields only', async () => {
    const created = await admin.post('/api/stations', {
      code: `E-${uniqueSuffix()}`,
      name: 'Old',
      kind: 'other',
    })
    const res = await admin.patch(`/api/stations/${created.body.id}`, {
      name: 'New name',
      isActive: false,
    })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ name: 'New name', isActive: false, kind: 'other' })
    const audit = await AuditEvent.findOne({
      where: { entity: 'station', entityId: created.body.id, action: 'station.update' },
    })
    expect(audit?.before).toMatchObject({ name: 'Old', isActive: true })
    expect(audit?.after).toMatchObject({ name: 'New name', isActive: false })
    expect(Object.keys(audit?.after as object)).not.toContain('code')
  })

  it('answers 404 for an unknown station and 400 for a malformed id', async () => {
    expect(
      (await admin.patch('/api/stations/00000000-0000-4000-8000-000000000000', { name: 'x' }))
        .status,
    ).toBe(404)
    const bad = await admin.patch('/api/stations/not-an-id', { name: 'x' })
    expect(bad.status).toBe(400)
  })
})
