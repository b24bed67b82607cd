import { createHash } from 'node:crypto'
import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { DeleteBucketCommand, GetObjectCommand } from '@aws-sdk/client-s3'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { env } from '../../server/env'
import { traceUnit } from '../../server/services/trace/trace'
import { dropDatabase, ownerUrlFor } from '../../scripts/lib/backupDb'
import { emptyBucket, listKeys, storeClient } from '../../scripts/lib/backupStore'
import { capture } from '../../scripts/lib/proc'

// The lane's demo shop is backed up with `npm run backup`, restored with `npm run restore` into
// a new database and bucket, and the copy is compared with the original.
const restoredDb = `${env.WAYMARK_DB}_restored`
const restoredBucket = `${env.s3.bucket}-restored`

/** Runs one of our scripts as npm would, in the lane's environment plus `extra`. */
const run = (args: string[], extra: Record<string, string> = {}) =>
  capture('npx', ['tsx', ...args], { env: { ...process.env, ...extra } })

/** Row counts of every table of the public schema, by name. */
async function rowCounts(database?: string): Promise<Record<string, number>> {
  const client = new pg.Client({ connectionString: ownerUrlFor(database) })
  await client.connect()
  try {
    const { rows } = await client.query<{ tablename: string }>(
      `SELECT tablename FROM pg_tables WHERE schemaname = 'public' ORDER BY tablename`,
    )
    const counts: Record<string, number> = {}
    for (const { tablename } of rows)
      counts[tablename] = Number(
        (await client.query(`SELECT count(*) AS n FROM "${tablename}"`)).rows[0].n,
      )
    return counts
  } finally {
    await client.end()
  }
}

async function firstRow<T>(sql: string): Promise<T> {
  const client = new pg.Client({ connectionString: ownerUrlFor() })
  await client.connect()
  try {
    return (await client.query(sql)).rows[0] as T
  } finally {
    await client.end()
  }
}

async function cleanUp(): Promise<void> {
  await dropDatabase(restoredDb)
  const s3 = storeClient()
  try {
    await emptyBucket(s3, restoredBucket).catch(() => undefined)
    await s3.send(new DeleteBucketCommand({ Bucket: restoredBucket })).catch(() => undefined)
  } finally {
    s3.destroy()
  }
}

describe('backup and restore', () => {
  let dir: string
  beforeAll(async () => {
    dir = await mkdtemp(join(tmpdir(), 'waymark-backup-test-'))
    await cleanUp() // a run stopped half-way leaves its copy behind
  })
  afterAll(async () => {
    await cleanUp()
    await rm(dir, { recursive: true, force: true })
  })

  it('restores the demo shop into a new database and bucket, and refuses a non-empty one', async () => {
    for (const script of ['scripts/backup.ts', 'scripts/restore.ts'])
      expect((await run([script, '--help'])).stdout).toMatch(/^Usage: npm run/)
    const archive = join(dir, 'shop.tar.gz')
    const backup = await run(['scripts/backup.ts', '--out', archive])
    expect(backup.code, backup.stderr).toBe(0)
    const before = await rowCounts()
    const into = ['--db', restoredDb, '--bucket', restoredBucket]
    const restore = await run(['scripts/restore.ts', archive, ...into])
    expect(restore.code, restore.stderr).toBe(0)

    const after = await rowCounts(restoredDb)
    expect(Object.keys(after).length).toBeGreaterThan(20)
    expect(after).toEqual(before)

    // A shipped unit's trace, computed by the trace service against each database.
    const { serial } = await firstRow<{ serial: string }>(
      `SELECT serial FROM units WHERE state = 'shipped' ORDER BY serial LIMIT 1`,
    )
    const traced = await run(['tests/api/support/traceOf.ts', serial], { WAYMARK_DB: restoredDb })
    expect(traced.code, traced.stderr).toBe(0)
    const original = await traceUnit(serial)
    expect(original.unit.serial).toBe(serial)
    // Everything but the moment each answer was made.
    const asData = ({ generatedAt: _at, ...rest }: { generatedAt: unknown }) => rest
    expect(asData(JSON.parse(traced.stdout))).toEqual(asData(JSON.parse(JSON.stringify(original))))

    // A certificate's file is in the new bucket, byte for byte.
    const cert = await firstRow<{ storage_key: string; sha256: string }>(
      `SELECT storage_key, sha256 FROM documents
        WHERE kind = 'certificate' AND status = 'done' ORDER BY created_at LIMIT 1`,
    )
    const s3 = storeClient()
    try {
      const digest = async (bucket: string) => {
        const out = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: cert.storage_key }))
        const body = Buffer.from(await out.Body!.transformToByteArray())
        return createHash('sha256').update(body).digest('hex')
      }
      expect(await digest(restoredBucket)).toBe(cert.sha256)
      expect(await digest(env.s3.bucket)).toBe(cert.sha256)
      expect((await listKeys(s3, restoredBucket)).sort()).toEqual(
        (await listKeys(s3, env.s3.bucket)).sort(),
      )
    } finally {
      s3.destroy()
    }

    // Again into the same, now full, database: refused without --force, nothing changed.
    const refused = await run(['scripts/restore.ts', archive, ...into])
    expect(refused.code).not.toBe(0)
    expect(refused.stderr).toMatch(/database \S+_restored is not empty .*--force/)
    expect(await rowCounts(restoredDb)).toEqual(before)
    const forced = await run(['scripts/restore.ts', archive, ...into, '--force'])
    expect(forced.code, forced.stderr).toBe(0)
    expect(await rowCounts(restoredDb)).toEqual(before)
  }, 240_000)
})
