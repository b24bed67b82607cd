import { existsSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import express from 'express'
import type { Express } from 'express'
import helmet from 'helmet'
import { env } from '../env'
import type { TrustProxy } from '../env'
import { csrfProtection } from '../middleware/csrf'
import { apiNotFound, errorHandler } from '../middleware/errorHandler'
import { passport } from '../middleware/passport'
import { requestLog } from '../middleware/requestLog'
import { sessionMiddleware } from '../middleware/session'
import { db } from '../models'
import { apiRouter } from '../routes'

const distDir = join(dirname(fileURLToPath(import.meta.url)), '..', '..', 'dist')

/**
 * Builds the Express app: middleware, the API, the built client, then the error handler.
 * `trustProxy` defaults to the TRUST_PROXY setting (tests pass another).
 */
export function buildApp(options: { trustProxy?: TrustProxy } = {}): Express {
  db() // fail fast on a missing database setting, before the first request
  const app = express()
  app.disable('x-powered-by')
  // Off by default: req.ip is then the socket's address, whatever X-Forwarded-For claims, so a
  // client cannot pick the address that the password limits and the audit log see.
  const trustProxy = options.trustProxy ?? env.trustProxy
  try {
    app.set('trust proxy', trustProxy)
  } catch (err) {
    throw new Error(`TRUST_PROXY: ${(err as Error).message}`, { cause: err })
  }
  app.use(requestLog)
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // Element Plus positions popups with inline style attributes.
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          // A plain-http installation (the loopback demo, a tablet on the LAN) must not be
          // upgraded to https.
          'upgrade-insecure-requests': env.isHttps ? [] : null,
        },
      },
      hsts: env.isHttps,
    }),
  )
  app.use('/api', express.json({ limit: '1mb' }))
  // No passport.initialize(): since passport 0.5.1 authenticate(), which passport.session() is,
  // gives the request login() and logout() itself; initialize() only adds a compatibility layer
  // for strategies written for passport 0.4, at a cost on every request.
  app.use('/api', sessionMiddleware(), passport.session())
  app.use('/api', csrfProtection)
  app.use('/api', apiRouter())
  app.use('/api', apiNotFound)
  if (existsSync(distDir)) {
    app.use(express.static(distDir, { index: false, maxAge: '1h' }))
    // Client-side routes (and the traveler URLs /u/<serial>) all load the single-page app.
    app.get(/^(?!\/api\/).*/, (_req, res) => res.sendFile(join(distDir, 'index.html')))
  }
  app.use(errorHandler)
  return app
}
