// What `npm run screenshots` sets up beside the app: the lane's queues emptied of what earlier
// test runs left there, and a mail fake on a free loopback port. Imported only after the script
// has set the test lane's environment, since the server modules read it when they load.
import { Queue } from 'bullmq'
import { startSmtpFake } from '../../server/devMail/smtpFake'
import { closeMail, setSmtpPortForTests } from '../../server/mail'
import { newQueueConnection, redisPrefix } from '../../server/redis'
import { DOCUMENTS_QUEUE } from '../../server/services/documents'
import { IMPORTS_QUEUE } from '../../server/services/imports'
import { MAIL_QUEUE } from '../../server/services/mail'
import { ALERTS_QUEUE } from '../../server/services/quality'

/**
 * Empties every queue under this lane's prefix (a test lane's own, never `npm start`'s), before
 * the seed queues the demo's jobs: jobs of earlier runs would show on the Status page as the
 * demo shop's. Returns how many jobs there were.
 */
export async function emptyLaneQueues(): Promise<number> {
  if (!/-test$/.test(redisPrefix))
    throw new Error(`screenshots: ${redisPrefix} is not a test lane's Redis prefix`)
  const connection = newQueueConnection()
  let removed = 0
  try {
    for (const name of [DOCUMENTS_QUEUE, MAIL_QUEUE, IMPORTS_QUEUE, ALERTS_QUEUE]) {
      const queue = new Queue(name, { connection, prefix: redisPrefix })
      const counts = await queue.getJobCounts()
      removed += Object.values(counts).reduce((sum, n) => sum + n, 0)
      await queue.obliterate({ force: true })
      await queue.close()
    }
  } finally {
    await connection.quit()
  }
  return removed
}

/** Starts the mail fake on a free port and points the app's mail transport at it. */
export async function startMailFake(): Promise<{ close: () => Promise<void> }> {
  const fake = await startSmtpFake({ port: 0 })
  setSmtpPortForTests(fake.port)
  return {
    async close() {
      closeMail()
      await fake.close()
    },
  }
}
