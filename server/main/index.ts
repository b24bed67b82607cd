import type { Server } from 'node:http'
import { buildApp } from './app'
import { env } from '../env'
import { logger } from '../logger'
import { closeSessionPool } from '../middleware/session'
import { closeDb } from '../models'
import { closeRedis } from '../redis'
import { closeDocumentsQueue } from '../services/documents'
import { closeMailQueue } from '../services/mail'
import { closeAlertsQueue } from '../services/quality'
import { closeImportsQueue } from '../services/imports'
import { closeMail } from '../mail'
import { DEMO_PASSWORD, DEMO_USERS } from '../seed/demoUsers'
import { startWorkers } from '../workers'

/** The only file that listens. It also runs the workers unless WAYMARK_WORKERS=off. */
async function main(): Promise<void> {
  const app = buildApp()
  const workers = env.WAYMARK_WORKERS === 'on' ? await startWorkers() : null
  const server: Server = app.listen(env.PORT, env.HOST, () => {
    // PORT=0 takes a free port: say which one, so a supervisor or a test can find it.
    const address = server.address()
    const port = typeof address === 'object' && address ? address.port : env.PORT
    const url = `http://${env.HOST}:${port}`
    const lines = [
      '',
      `Waymark is ready at ${url}`,
      '',
      `Demo sign-ins (demo data only; password "${DEMO_PASSWORD}"):`,
      ...DEMO_USERS.map((u) => `  ${u.role.padEnd(9)} ${u.email}`),
      '',
      'Ctrl-C stops the app; "npm run services stop" stops PostgreSQL, Redis and the object store.',
      '',
    ]
    process.stdout.write(lines.join('\n') + '\n')
  })

  let isStopping = false
  const stop = async (signal: string) => {
    if (isStopping) return
    isStopping = true
    logger.info({ signal }, 'shutting down')
    server.close()
    server.closeAllConnections()
    await workers?.close()
    closeMail()
    await Promise.allSettled([
      closeDb(),
      closeSessionPool(),
      closeRedis(),
      closeDocumentsQueue(),
      closeMailQueue(),
      closeAlertsQueue(),
      closeImportsQueue(),
    ])
    process.exit(0)
  }
  process.on('SIGINT', () => void stop('SIGINT'))
  process.on('SIGTERM', () => void stop('SIGTERM'))
}

main().catch((err: unknown) => {
  logger.fatal({ err }, 'could not start')
  process.exit(1)
})
