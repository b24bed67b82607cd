import session from 'express-session'
import { env, requireSetting } from '../env'
import { closeSessionStore, sessionStore } from '../services/auth'

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
    store: sessionStore(),
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
export function closeSessionPool(): Promise<void> {
  return closeSessionStore()
}
