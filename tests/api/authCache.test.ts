import { QueryTypes } from 'sequelize'
import { describe, expect, it } from 'vitest'
import { isAuthCacheLive } from '../../server/services/auth/authCache'
import { db } from '../../server/models'
import { TestClient, signedInRoles, uniqueSuffix } from './support/client'

// The session row and the user behind a signed-in request are cached in memory (authCache.ts).
// These changes are made straight in the database, as another API process or an operator's psql
// would make them: the cache must hear of each through PostgreSQL's notifications.

/** Asks until `check` holds, for up to 3 s; returns whether it came to hold. */
async function eventually(check: () => Promise<boolean>): Promise<boolean> {
  for (const started = Date.now(); Date.now() - started < 3000;) {
    if (await check()) return true
    await new Promise((r) => setTimeout(r, 25))
  }
  return false
}

async function newUser(
  admin: TestClient,
  role: string,
): Promise<{ id: string; client: TestClient }> {
  const email = `cached-${uniqueSuffix()}@ferncastle.example`.toLowerCase()
  const created = await admin
    .post('/api/users', { email, name: 'Cached Person', role, password: 'long-enough-1' })
    .expect(201)
  const client = new TestClient()
  await client.signIn(email, 'long-enough-1')
  return { id: created.body.id as string, client }
}

describe('auth cache', () => {
  const { admin } = signedInRoles('admin')

  it('is in use once the notification channel listens', async () => {
    await admin.get('/api/auth/me').expect(200)
    expect(await eventually(async () => isAuthCacheLive())).toBe(true)
  })

  it('takes a role change made elsewhere on a following request', async () => {
    const { id, client } = await newUser(admin, 'operator')
    // Twice, so the second answer comes from the cache.
    await client.get('/api/users').expect(403)
    await client.get('/api/users').expect(403)
    await db().query(`UPDATE users SET role = 'admin' WHERE id = :id`, {
      replacements: { id },
      type: QueryTypes.UPDATE,
    })
    expect(await eventually(async () => (await client.get('/api/users')).status === 200)).toBe(true)
  })

  it('signs out a session deleted elsewhere', async () => {
    const { id, client } = await newUser(admin, 'lead')
    await client.get('/api/stations').expect(200)
    await client.get('/api/stations').expect(200)
    await db().query(`DELETE FROM sessions WHERE sess -> 'passport' ->> 'user' = :id`, {
      replacements: { id },
      type: QueryTypes.DELETE,
    })
    expect(await eventually(async () => (await client.get('/api/stations')).status === 401)).toBe(
      true,
    )
  })

  it('refuses a user deactivated elsewhere', async () => {
    const { id, client } = await newUser(admin, 'lead')
    await client.get('/api/stations').expect(200)
    await client.get('/api/stations').expect(200)
    await db().query('UPDATE users SET is_active = false WHERE id = :id', {
      replacements: { id },
      type: QueryTypes.UPDATE,
    })
    expect(await eventually(async () => (await client.get('/api/stations')).status === 401)).toBe(
      true,
    )
  })
})
