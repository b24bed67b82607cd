import { parseArgs } from 'node:util'
import { QueryTypes } from 'sequelize'
import { loadDemo, loadPeopleAndFloor } from '../server/seed/demo'
import { migrator, ownerConnection } from '../server/db/migrator'
import { env } from '../server/env'
import { closeDb } from '../server/models'
import { closeAlertsQueue } from '../server/services/quality'
import { closeDocumentsQueue } from '../server/services/documents'
import { closeMailQueue } from '../server/services/mail'

const HELP = `Usage: tsx scripts/seed.ts [--if-empty] [--minimal] [--reset]

Loads the invented demo scenario (Ferncastle Power) into the database named by WAYMARK_DB: six
weeks of working days ending yesterday, the same story on every run (a fixed random seed).
  --if-empty  do nothing when the database already has users (what npm start uses)
  --minimal   only the demo people and stations, no recipes, lots or papers (the fault tests)
  --reset     empty the database and migrate it first, so the demo's past ends yesterday again;
              refused when it holds any account outside the demo shop (@ferncastle.example)`

const { values } = parseArgs({
  options: {
    'if-empty': { type: 'boolean' },
    minimal: { type: 'boolean' },
    reset: { type: 'boolean' },
    help: { type: 'boolean' },
  },
})
if (values.help) {
  console.log(HELP)
  process.exit(0)
}

/**
 * Drops and recreates the schema, then migrates it, as the owner role. A database with a real
 * account in it is left alone: the demo never wipes a shop that has started using Waymark.
 */
async function resetDatabase(): Promise<void> {
  const owner = ownerConnection()
  try {
    const [tables] = await owner.query<{ n: string }>(
      `SELECT count(*) AS n FROM pg_tables WHERE schemaname = 'public' AND tablename = 'users'`,
      { type: QueryTypes.SELECT },
    )
    if (Number(tables?.n) > 0) {
      const [others] = await owner.query<{ n: string }>(
        `SELECT count(*) AS n FROM users WHERE email NOT LIKE '%@ferncastle.example'`,
        { type: QueryTypes.SELECT },
      )
      if (Number(others?.n) > 0)
        throw new Error(
          `seed --reset: ${env.WAYMARK_DB} has ${others!.n} account(s) outside the demo shop; not resetting it`,
        )
    }
    await owner.query('DROP SCHEMA IF EXISTS public CASCADE')
    await owner.query('CREATE SCHEMA public')
    const ran = await migrator(owner).up()
    console.log(`seed: ${env.WAYMARK_DB}: emptied and migrated (${ran.length} migrations)`)
  } finally {
    await owner.close()
  }
}

try {
  if (values.reset) await resetDatabase()
  const started = Date.now()
  if (values.minimal) {
    await loadPeopleAndFloor()
    console.log(`seed: ${env.WAYMARK_DB}: demo people and stations loaded`)
  } else {
    const loaded = await loadDemo({ onlyIfEmpty: values['if-empty'] ?? false })
    console.log(
      `seed: ${env.WAYMARK_DB}: ${loaded ? `demo scenario loaded in ${((Date.now() - started) / 1000).toFixed(1)} s` : 'already has data, left as it is'}`,
    )
  }
} finally {
  // The demo's step runs ask for alert checks as every recorded run does.
  await Promise.all([closeDb(), closeDocumentsQueue(), closeMailQueue(), closeAlertsQueue()])
}
// Nothing else should be left open, but a seed must never hang the start or test run.
process.exit(0)
