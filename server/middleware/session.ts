import connectPgSimple from 'connect-pg-simple'
import session from 'express-session'
import pg from 'pg'
import { env, requireSetting } from '../env'

const PgStore = connectPgSimple(session)

/** Eight hours from sign-in: one shift. */
const SESSION_MAX_AGE_MS = 8 * 60 * 60 * 1000

let pool: pg.Pool | undefined

/** The session pool, shared so shutdown can close it. */
export function sessionPool(): pg.Pool {
  pool ??= new pg.Pool({
    connectionString: requireSetting(env.databaseUrl, 'the database URL'),
    max: 5,
  })
  return pool
}

/**
 * Sessions live in PostgreSQL, so any API process behind a proxy can serve any request. Expired
 * rows are swept by the maintenance worker rather than by a timer in every API process.
 */
export function sessionMiddleware() {
  return session({
    name: 'waymark.sid',
    secret: requireSetting(env.sessionSecret, 'the session secret'),
    store: new PgStore({
      pool: sessionPool(),
      tableName: 'sessions',
      createTableIfMissing: false,
      pruneSessionInterval: false,
      // No write per request: a session lasts one shift from sign-in (see SESSION_MAX_AGE_MS).
      disableTouch: true,
    }),
    resave: false,
    saveUninitialized: false,
    rolling: false,
    proxy: env.isProduction,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      // Secure in production. Behind a TLS proxy ('auto') the flag follows X-Forwarded-Proto, so
      // the same build still signs in on a plain-http loopback demo, where a Secure cookie
      // would never come back and every form would fail its CSRF check.
      secure: env.isHttps ? true : env.isProduction ? 'auto' : false,
      maxAge: SESSION_MAX_AGE_MS,
    },
  })
}

export async function closeSessionPool(): Promise<void> {
  await pool?.end()
  pool = undefined
}
