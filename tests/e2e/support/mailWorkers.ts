import type { Redis } from 'ioredis'
import { startSmtpFake } from '../../../server/devMail/smtpFake'
import { closeMail, setSmtpPortForTests } from '../../../server/mail'
import { newQueueConnection } from '../../../server/redis'
import { startDocumentsWorker } from '../../../server/services/documents'
import { closeDocumentsQueue } from '../../../server/services/documents/queue'
import { startMailWorker } from '../../../server/services/mail'
import { closeMailQueue } from '../../../server/services/mail/queue'

/**
 * Hooks for `useE2eApp` that run the documents and mail workers and an SMTP fake in the test's
 * process, as `npm start` runs them beside the app: for a test that makes a paper and mails it.
 */
export function withMailWorkers(): { before: () => Promise<void>; after: () => Promise<void> } {
  let fake: Awaited<ReturnType<typeof startSmtpFake>> | undefined
  let connection: Redis | undefined
  let documents: ReturnType<typeof startDocumentsWorker> | undefined
  let mail: ReturnType<typeof startMailWorker> | undefined
  return {
    before: async () => {
      fake = await startSmtpFake({ port: 0 })
      setSmtpPortForTests(fake.port)
      connection = newQueueConnection()
      documents = startDocumentsWorker(connection)
      mail = startMailWorker(connection)
    },
    after: async () => {
      documents?.stop()
      mail?.stop()
      await Promise.all([documents?.worker.close(), mail?.worker.close()])
      await closeDocumentsQueue()
      await closeMailQueue()
      await connection?.quit()
      closeMail()
      await fake?.close()
    },
  }
}
