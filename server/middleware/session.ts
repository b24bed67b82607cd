import connectPgSimple from 'connect-pg-simple'
import session from 'express-session'
import type { SessionData } from 'express-session'
import { closeSqlPool, sqlPool } from '../db/pool'
import { env, requireSetting } from '../env'
import { cachedSession, closeAuthCache, forgetSession } from './authCache'

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

/** Eight hours from sign-in: one shift. */
const SESSION_MAX_AGE_MS = 8 * 60 * 60 * 1000

/**
 * Sessions live in PostgreSQL, so any API process behind a proxy can serve any request. Expired
 * rows are swept by the maintenance worker rather than by a timer in every API process.
 */
export function sessionMiddleware() {
  return session({
    name: 'waymark.sid',
    secret: requireSetting(env.sessionSecret, 'the session secret'),
    store: new CachedPgStore({
      pool: sqlPool(),
      tableName: 'sessions',
      createTableIfMissing: false,
      pruneSessionInterval: false,
      // No write per request: a session lasts one shift from sign-in (see SESSION_MAX_AGE_MS).
      disableTouch: true,
    }),
    resave: false,
    saveUninitialized: false,
    rolling: false,
    // Undefined: the Secure flag follows req.secure, i.e. Express's `trust proxy` (TRUST_PROXY).
    proxy: undefined,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      // Secure in production. Behind a TLS proxy named in TRUST_PROXY ('auto') the flag follows
      // X-Forwarded-Proto, so the same build still signs in on a plain-http loopback demo, where
      // a Secure cookie would never come back and every form would fail its CSRF check.
      secure: env.isHttps ? true : env.isProduction ? 'auto' : false,
      maxAge: SESSION_MAX_AGE_MS,
    },
  })
}

/** Closes what sessions hold: the plain pg pool and the auth cache's notification channel. */
export async function closeSessionPool(): Promise<void> {
  await closeAuthCache()
  await closeSqlPool()
}
