import { mkdtemp, readFile, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { parseArgs } from 'node:util'
import { env } from '../server/env'
import {
  createDatabase,
  databaseOf,
  ownerUrlFor,
  restoreDatabase,
  tableCount,
} from './lib/backupDb'
import { emptyBucket, loadObjects, prepareBucket, storeClient } from './lib/backupStore'
import type { Manifest } from './lib/backupStore'
import { mustRun, ServiceError } from './lib/proc'

const HELP = `Usage: npm run restore -- FILE [--db NAME] [--bucket NAME] [--force]

Brings back an archive written by npm run backup: the database dump and every stored object.
  --db NAME      restore into this database (made if it does not exist; default WAYMARK_DB)
  --bucket NAME  restore into this bucket (made if it does not exist; default S3_BUCKET)
  --force        restore even though the database has tables or the bucket has objects: what
                 the archive holds replaces them, and the bucket is emptied first
Without --force, a database or bucket that is not empty is refused and nothing is changed.`

const { values, positionals } = parseArgs({
  allowPositionals: true,
  options: {
    db: { type: 'string' },
    bucket: { type: 'string' },
    force: { type: 'boolean' },
    help: { type: 'boolean' },
  },
})
if (values.help) {
  console.log(HELP)
  process.exit(0)
}

/** Refuses, with the reason and a non-zero exit, and changes nothing. */
class Refusal extends Error {}

async function restore(file: string, work: string): Promise<string> {
  const isForced = values.force ?? false
  const url = ownerUrlFor(values.db)
  const database = databaseOf(url)
  const bucket = values.bucket ?? env.s3.bucket
  await mustRun('tar', ['-xzf', file, '-C', work])
  const manifest = JSON.parse(await readFile(join(work, 'manifest.json'), 'utf8')) as Manifest
  if (manifest.format !== 'waymark-backup/1')
    throw new Refusal(`${file} is not a Waymark backup (manifest format ${manifest.format})`)
  const s3 = storeClient()
  try {
    const tables = await tableCount(url)
    const objects = await prepareBucket(s3, bucket)
    if (!isForced && (tables ?? 0) > 0)
      throw new Refusal(
        `database ${database} is not empty (${tables} tables): restore into an empty or new one (--db NAME), or pass --force to replace it`,
      )
    if (!isForced && objects > 0)
      throw new Refusal(
        `bucket ${bucket} is not empty (${objects} objects): restore into an empty or new one (--bucket NAME), or pass --force to replace it`,
      )
    if (tables === null) await createDatabase(database)
    await restoreDatabase(url, join(work, manifest.databaseDump), isForced && (tables ?? 0) > 0)
    if (isForced && objects > 0) await emptyBucket(s3, bucket)
    await loadObjects(s3, bucket, work, manifest.objects)
  } finally {
    s3.destroy()
  }
  return `restore: ${manifest.database} of ${manifest.createdAt} -> database ${database}; ${manifest.objectCount} object(s) -> bucket ${bucket}`
}

const [file] = positionals
if (!file) {
  console.error('restore: name the archive to restore (npm run restore -- FILE); --help for more')
  process.exit(2)
}
const work = await mkdtemp(join(tmpdir(), 'waymark-restore-'))
try {
  console.log(await restore(resolve(file), work))
} catch (err) {
  const isClear = err instanceof Refusal || err instanceof ServiceError
  console.error(`restore refused: ${isClear ? err.message : String(err)}`)
  process.exitCode = 1
} finally {
  await rm(work, { recursive: true, force: true })
}
