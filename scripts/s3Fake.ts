// Local stand-in for S3 (s3rver on loopback), run in the background by scripts/services.ts.
import S3rver from 's3rver'

if (process.argv.includes('--help')) {
  console.log('usage: tsx scripts/s3Fake.ts  (env WAYMARK_S3_PORT, WAYMARK_S3_DIR)')
  console.log('Serves an S3-compatible fake on 127.0.0.1; started by `npm run services start`.')
  process.exit(0)
}

const port = Number(process.env.WAYMARK_S3_PORT || 56569)
const directory = process.env.WAYMARK_S3_DIR
if (!directory) {
  console.error('s3Fake: WAYMARK_S3_DIR is not set')
  process.exit(1)
}

const server = new S3rver({ port, address: '127.0.0.1', silent: true, directory })
const address = await server.run()
console.log(`s3rver listening on ${address.address}:${address.port}, files in ${directory}`)

for (const signal of ['SIGTERM', 'SIGINT'] as const) {
  process.on(signal, () => {
    // close() waits for idle keep-alive sockets; do not let one hold up a stop.
    setTimeout(() => process.exit(0), 2000).unref()
    server.close().finally(() => process.exit(0))
  })
}
