import { fileURLToPath } from 'node:url'
import type { Worker } from 'bullmq'
import { logger } from '../logger'
import { closeDocumentsQueue, startDocumentsWorker } from '../services/documents'
import { closeImportsQueue, startImportsWorker } from '../services/imports'
import { closeMailQueue, startMailWorker } from '../services/mail'
import { closeAlertsQueue, startAlertsWorker } from '../services/quality'
import { newQueueConnection } from '../redis'
import { scheduleMaintenance, startMaintenanceWorker } from './maintenance'

/** Starts every queue's worker on one fresh Redis connection; `close()` drains them. */
export async function startWorkers(): Promise<{ close: () => Promise<void> }> {
  const connection = newQueueConnection()
  await scheduleMaintenance(connection)
  const documents = startDocumentsWorker(connection)
  const mail = startMailWorker(connection)
  const alerts = startAlertsWorker(connection)
  const imports = startImportsWorker(connection)
  const workers: Worker[] = [
    startMaintenanceWorker(connection),
    documents.worker,
    mail.worker,
    alerts.worker,
    imports.worker,
  ]
  for (const w of workers)
    w.on('failed', (job, err) => logger.error({ err, job: job?.id, queue: w.name }, 'job failed'))
  // Jobs asked for while Redis was away wait as rows in PostgreSQL (documents, e-mails, imports
  // `queued`; step runs for the alerts). Sweep them as soon as Redis answers again, rather than
  // at the next timed sweep minutes later.
  let isRedisDown = false
  const down = () => {
    isRedisDown = true
  }
  connection.on('close', down)
  connection.on('error', down)
  connection.on('ready', () => {
    if (!isRedisDown) return
    isRedisDown = false
    logger.info('redis is back; sweeping the jobs that waited in the database')
    for (const queue of [documents, mail, alerts, imports]) queue.sweepNow()
  })
  logger.info({ queues: workers.map((w) => w.name) }, 'workers started')
  return {
    close: async () => {
      documents.stop()
      mail.stop()
      alerts.stop()
      imports.stop()
      await Promise.all(workers.map((w) => w.close()))
      await closeDocumentsQueue()
      await closeMailQueue()
      await closeAlertsQueue()
      await closeImportsQueue()
      await connection.quit()
    },
  }
}

// Run on its own (`tsx server/workers/index.ts`) to scale workers apart from the API.
if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const running = await startWorkers()
  const stop = () => void running.close().then(() => process.exit(0))
  process.on('SIGINT', stop)
  process.on('SIGTERM', stop)
}
