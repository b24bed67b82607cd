import { readdirSync, readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'

const folder = fileURLToPath(new URL('../../../../../server/db/migrations/', import.meta.url))
const migrations = readdirSync(folder).filter((f) => /^\d{14}-.+\.ts$/.test(f))

describe('migrations', () => {
  it('are found', () => {
    // Common practice, no source: a guard that reads no file would pass for nothing.
    expect(migrations.length).toBeGreaterThan(30)
  })

  it('import nothing of the app, so each does the same on every database it runs on', () => {
    // A list read from shared/ (roles, station kinds) may grow; a migration that reads it would
    // build a different enum or CHECK on a database set up later than one set up earlier.
    const importing = migrations.filter((f) =>
      /from '\.\.\/\.\.\/\.\.\/(shared|server)\//.test(readFileSync(folder + f, 'utf8')),
    )
    expect(importing).toEqual([])
  })
})
