// Local SMTP fake that files every message in the Outbox, run in the background by scripts/services.ts.
import { closeDb } from '../server/models'
import { startSmtpFake } from '../server/devMail/smtpFake'

if (process.argv.includes('--help')) {
  console.log('usage: tsx scripts/smtpFake.ts  (env WAYMARK_SMTP_PORT, WAYMARK_DB, S3_BUCKET)')
  console.log('Accepts mail on 127.0.0.1 and files it as "received" rows in the emails table;')
  console.log('started by `npm run services start` unless SMTP_URL is set.')
  process.exit(0)
}

const port = Number(process.env.WAYMARK_SMTP_PORT || 2526)
if (!Number.isInteger(port) || port < 1 || port > 65535) {
  console.error(`smtpFake: WAYMARK_SMTP_PORT must be a port number, got "${port}"`)
  process.exit(1)
}

const fake = await startSmtpFake({ port, host: '127.0.0.1' })
console.log(
  `smtp fake listening on 127.0.0.1:${fake.port}, filing into database ${process.env.WAYMARK_DB || 'waymark'}`,
)

for (const signal of ['SIGTERM', 'SIGINT'] as const) {
  process.on(signal, () => {
    // close() waits for open sessions; do not let one hold up a stop.
    setTimeout(() => process.exit(0), 2000).unref()
    void fake
      .close()
      .then(closeDb)
      .finally(() => process.exit(0))
  })
}
