import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { dirname, join, resolve } from 'node:path'
import { parseArgs } from 'node:util'
import { env } from '../server/env'
import { databaseOf, dumpDatabase, ownerUrlFor } from './lib/backupDb'
import { saveObjects, storeClient } from './lib/backupStore'
import type { Manifest } from './lib/backupStore'
import { mustRun, ServiceError } from './lib/proc'

const HELP = `Usage: npm run backup -- [--out FILE]

Writes one .tar.gz archive of the app's data: a pg_dump (custom format) of the database named
by WAYMARK_DB, every object of the bucket named by S3_BUCKET, and manifest.json (when it was
made, the database and bucket, and each object's key, size and sha256).
  --out FILE  where to write it (default: <data folder>/backups/<database>-<time>.tar.gz)
Bring it back with: npm run restore -- FILE`

const { values } = parseArgs({
  options: { out: { type: 'string' }, help: { type: 'boolean' } },
})
if (values.help) {
  console.log(HELP)
  process.exit(0)
}

const createdAt = new Date()
const url = ownerUrlFor()
const database = databaseOf(url)
const stamp = createdAt.toISOString().replace(/[:.]/g, '-')
const out = resolve(
  values.out ?? join(env.WAYMARK_DATA_DIR, 'backups', `${database}-${stamp}.tar.gz`),
)
const work = await mkdtemp(join(tmpdir(), 'waymark-backup-'))
const s3 = storeClient()
try {
  await dumpDatabase(url, join(work, 'database.dump'))
  const objects = await saveObjects(s3, env.s3.bucket, work)
  const manifest: Manifest = {
    format: 'waymark-backup/1',
    createdAt: createdAt.toISOString(),
    database,
    bucket: env.s3.bucket,
    databaseDump: 'database.dump',
    objectCount: objects.length,
    objects,
  }
  await writeFile(join(work, 'manifest.json'), `${JSON.stringify(manifest, null, 2)}\n`)
  await mkdir(dirname(out), { recursive: true })
  await mustRun('tar', ['-czf', out, '-C', work, '.'])
  console.log(`backup: ${database} and ${objects.length} object(s) of ${env.s3.bucket} -> ${out}`)
} catch (err) {
  console.error(`backup failed: ${err instanceof ServiceError ? err.message : String(err)}`)
  process.exitCode = 1
} finally {
  s3.destroy()
  await rm(work, { recursive: true, force: true })
}
