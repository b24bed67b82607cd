import { createServer } from 'node:net'
import { Email } from '../../../server/models'
import { startSmtpFake } from '../../../server/devMail/smtpFake'
import { closeMail, setSmtpPortForTests } from '../../../server/mail'
import { newQueueConnection } from '../../../server/redis'
import { startMailWorker } from '../../../server/services/mail'
import { closeMailQueue } from '../../../server/services/mail/queue'

/**
 * A fake SMTP server on a free loopback port with the mail worker sending to it, for tests
 * that follow an e-mail out of the Outbox. Call `stop` in `afterAll`.
 */
export async function startMailRig() {
  const fake = await startSmtpFake({ port: 0 })
  setSmtpPortForTests(fake.port)
  const connection = newQueueConnection()
  const mail = startMailWorker(connection)
  return {
    fake,
    /**
     * Stops the worker and its queue, then the Redis connection, the transport and the fake.
     * @param closeQueues closes the other queues a test used, before the connection goes
     */
    async stop(closeQueues?: () => Promise<void>) {
      mail.stop()
      await mail.worker.close()
      await closeMailQueue()
      await closeQueues?.()
      await connection.quit()
      closeMail()
      await fake.close()
    },
  }
}

/** A loopback port nothing listens on: point the mail transport at it and the relay is down. */
export async function closedPort(): Promise<number> {
  const server = createServer()
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve))
  const address = server.address()
  await new Promise((resolve) => server.close(resolve))
  return typeof address === 'object' && address ? address.port : 1
}

/** Polls the e-mail's row until it reaches `status` or 15 s pass; returns the row either way. */
export async function waitForEmailStatus(id: string, status: string): Promise<Email> {
  const deadline = Date.now() + 15_000
  for (;;) {
    const row = (await Email.findByPk(id))!
    if (row.status === status || Date.now() > deadline) return row
    await new Promise((r) => setTimeout(r, 100))
  }
}
