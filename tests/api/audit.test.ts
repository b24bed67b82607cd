import { QueryTypes } from 'sequelize'
import { beforeAll, describe, expect, it } from 'vitest'
import { db } from '../../server/models'
import { resetSignInLimits, signedInAs, testApp } from './support/client'

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
})
