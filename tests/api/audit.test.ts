import { QueryTypes } from 'sequelize'
import { beforeAll, describe, expect, it } from 'vitest'
import { db } from '../../server/models'
import { parse } from 'csv-parse/sync'
import { DEMO_USERS } from '../../server/seed/demoUsers'
import { resetSignInLimits, signedInAs, testApp, uniqueSuffix } from './support/client'

describe('audit log', () => {
  beforeAll(async () => {
    testApp()
    await resetSignInLimits()
  })

  it('cannot be updated or deleted by the role the app connects as', async () => {
    const [row] = await db().query<{ id: string }>(
      'SELECT id FROM audit_events ORDER BY id LIMIT 1',
      {
        type: QueryTypes.SELECT,
      },
    )
    expect(row).toBeDefined()
    await expect(
      db().query(`UPDATE audit_events SET action = 'forged' WHERE id = :id`, { replacements: row }),
    ).rejects.toThrow(/permission denied|append-only/)
    await expect(
      db().query('DELETE FROM audit_events WHERE id = :id', { replacements: row }),
    ).rejects.toThrow(/permission denied|append-only/)
    await expect(db().query('TRUNCATE audit_events')).rejects.toThrow(
      /permission denied|append-only/,
    )
    const [still] = await db().query<{ action: string }>(
      'SELECT action FROM audit_events WHERE id = :id',
      {
        replacements: row,
        type: QueryTypes.SELECT,
      },
    )
    expect(still.action).not.toBe('forged')
  })

  it('connects as a role that is neither superuser nor the schema owner', async () => {
    const [me] = await db().query<{ rolsuper: boolean; owns: boolean }>(
      `SELECT r.rolsuper, (SELECT nspowner = r.oid FROM pg_namespace WHERE nspname = 'public') AS owns
         FROM pg_roles r WHERE r.rolname = current_user`,
      { type: QueryTypes.SELECT },
    )
    expect(me).toEqual({ rolsuper: false, owns: false })
  })

  it('lists events newest first for an admin, filtered by entity', async () => {
    const admin = await signedInAs('admin')
    const res = await admin.get('/api/audit-events?entity=user&pageSize=5').expect(200)
    expect(res.body.total).toBeGreaterThan(0)
    expect(res.body.rows.length).toBeLessThanOrEqual(5)
    expect(res.body.rows.every((r: { entity: string }) => r.entity === 'user')).toBe(true)
    const times = res.body.rows.map((r: { at: string }) => r.at)
    expect([...times].sort().reverse()).toEqual(times)
  })

  describe('read by a person', () => {
    const adminName = DEMO_USERS.find((u) => u.role === 'admin')!.name
    let stationId = ''
    let code = ''

    beforeAll(async () => {
      const admin = await signedInAs('admin')
      code = `AUD-${uniqueSuffix()}`
      const created = await admin
        .post('/api/stations', { code, name: 'Audit bench', kind: 'other' })
        .expect(201)
      stationId = created.body.id
      await admin.patch(`/api/stations/${stationId}`, { name: 'Audit bench 2' }).expect(200)
    })

    it('names the person, the record and the change list instead of ids and JSON', async () => {
      const admin = await signedInAs('admin')
      const res = await admin.get(`/api/audit-events?thing=${code}`).expect(200)
      expect(res.body.total).toBe(2)
      const [update, create] = res.body.rows
      expect(update).toMatchObject({
        actorName: adminName,
        actionText: 'station changed',
        entityText: 'station',
        entityId: stationId,
        entityLabel: `${code} Audit bench 2`,
        changes: [{ field: 'name', before: 'Audit bench', after: 'Audit bench 2' }],
      })
      expect(create.actionText).toBe('station created')
      expect(create.changes).toContainEqual({ field: 'code', before: '—', after: code })
    })

    it('filters by person and by day range', async () => {
      const admin = await signedInAs('admin')
      const me = (await admin.get('/api/auth/me').expect(200)).body.user
      const today = new Date().toISOString().slice(0, 10)
      const mine = await admin
        .get(`/api/audit-events?actorId=${me.id}&thing=${code}&from=${today}&to=${today}`)
        .expect(200)
      expect(mine.body.total).toBe(2)
      const lead = await signedInAs('lead')
      const leadMe = (await lead.get('/api/auth/me').expect(200)).body.user
      const theirs = await admin
        .get(`/api/audit-events?actorId=${leadMe.id}&thing=${code}`)
        .expect(200)
      expect(theirs.body.total).toBe(0)
      const before = await admin.get(`/api/audit-events?thing=${code}&to=2020-01-01`).expect(200)
      expect(before.body.total).toBe(0)
    })

    it('exports the same filters as CSV with readable columns', async () => {
      const admin = await signedInAs('admin')
      const res = await admin.get(`/api/audit-events?thing=${code}&format=csv`).expect(200)
      expect(res.headers['content-type']).toMatch(/text\/csv/)
      expect(res.headers['content-disposition']).toMatch(/attachment; filename="audit-log-/)
      expect(res.headers['x-waymark-truncated']).toBe('no')
      const rows = parse(res.text) as string[][]
      expect(rows[0]).toEqual([
        'time (UTC)',
        'who',
        'action',
        'what happened',
        'record kind',
        'record',
        'changes',
        'from address',
      ])
      expect(rows).toHaveLength(3)
      expect(rows[1][1]).toContain(adminName)
      expect(rows[1][3]).toBe('station changed')
      expect(rows[1][5]).toBe(`${code} Audit bench 2`)
      expect(rows[1][6]).toBe('name: Audit bench → Audit bench 2')
    })

    it('refuses bad filters with a 400 naming the field, and other roles with a 403', async () => {
      const admin = await signedInAs('admin')
      const bad = await admin.get('/api/audit-events?from=yesterday').expect(400)
      expect(JSON.stringify(bad.body)).toContain('from')
      const backwards = await admin.get('/api/audit-events?from=2026-02-02&to=2026-02-01')
      expect(backwards.status).toBe(400)
      expect(JSON.stringify(backwards.body)).toContain('to')
      const person = await admin.get('/api/audit-events?actorId=92835df7').expect(400)
      expect(JSON.stringify(person.body)).toContain('actorId')
      const lead = await signedInAs('lead')
      await lead.get('/api/audit-events?format=csv').expect(403)
    })
  })
})
