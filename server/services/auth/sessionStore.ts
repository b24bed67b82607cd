import connectPgSimple from 'connect-pg-simple'
import session from 'express-session'
import type { SessionData, Store } from 'express-session'
import type { UserDto } from '../../../shared/schemas/auth'
import { closePlainPool, namedSql, plainPool, prepared } from '../../db/sql'
import { cachedSession, cachedUser, closeAuthCache, forgetSession } from './authCache'

const PgStore = connectPgSimple(session)

type Done = (err?: unknown) => void

/**
 * The PostgreSQL session store with reads served from the auth cache while it is live (see
 * authCache.ts); saves and destroys go to the database and forget the cached row.
 */
class CachedPgStore extends PgStore {
  override get(sid: string, done: (err: unknown, session?: SessionData | null) => void): void {
    const load = () =>
      new Promise<string | null>((resolve, reject) =>
        super.get(sid, (err, sess) =>
          err ? reject(err) : resolve(sess ? JSON.stringify(sess) : null),
        ),
      )
    cachedSession(sid, load, expiresAt).then(
      (json) => done(null, json ? (JSON.parse(json) as SessionData) : null),
      (err: unknown) => done(err),
    )
  }

  override set(sid: string, sess: SessionData, done?: Done): void {
    forgetSession(sid)
    super.set(sid, sess, (err?: unknown) => {
      forgetSession(sid)
      done?.(err)
    })
  }

  override destroy(sid: string, done?: Done): void {
    forgetSession(sid)
    super.destroy(sid, (err?: unknown) => {
      forgetSession(sid)
      done?.(err)
    })
  }
}

/** When a cached session row must be read again at the latest: its cookie's expiry. */
function expiresAt(json: string): number {
  const expires = (JSON.parse(json) as SessionData).cookie?.expires
  return expires ? new Date(expires).getTime() : Infinity
}

/**
 * The store for express-session: rows in the `sessions` table on the plain pool, so any API
 * process behind a proxy can serve any request. Expired rows are swept by the maintenance
 * worker (`sweepExpiredSessions`) rather than by a timer in every API process.
 */
export function sessionStore(): Store {
  return new CachedPgStore({
    pool: plainPool(),
    tableName: 'sessions',
    createTableIfMissing: false,
    pruneSessionInterval: false,
    // No write per request: a session lasts one shift from sign-in.
    disableTouch: true,
  })
}

// The session stores only the user id; the user is read again for every request, so a role
// change or a deactivation takes effect at once. The read goes through the auth cache, which
// PostgreSQL's notifications keep in step with every change (authCache.ts).
const SESSION_USER = namedSql(
  'session-user',
  'SELECT id, email, name, role FROM users WHERE id = $1 AND is_active',
)

/** The signed-in user of a session (by the id the session holds), or null if gone or inactive. */
export async function sessionUser(id: string): Promise<UserDto | null> {
  const user = await cachedUser(id, async () => {
    const [row] = await prepared<UserDto>(SESSION_USER, [id])
    return row ?? null
  })
  return user ? { ...user } : null
}

/** Closes what sessions hold: the plain pg pool and the auth cache's notification channel. */
export async function closeSessionStore(): Promise<void> {
  await closeAuthCache()
  await closePlainPool()
}
