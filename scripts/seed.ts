import { parseArgs } from 'node:util'
import { loadDemo, loadPeopleAndFloor } from '../server/seed/demo'
import { env } from '../server/env'
import { closeDb } from '../server/models'
import { closeAlertsQueue } from '../server/services/quality'
import { closeDocumentsQueue } from '../server/services/documents'
import { closeMailQueue } from '../server/services/mail'

const HELP = `Usage: tsx scripts/seed.ts [--if-empty] [--minimal]

Loads the invented demo scenario (Ferncastle Power) into the database named by WAYMARK_DB.
  --if-empty  do nothing when the database already has users (what npm start uses)
  --minimal   only the demo people and stations, no recipes, lots or papers (the fault tests)`

const { values } = parseArgs({
  options: {
    'if-empty': { type: 'boolean' },
    minimal: { type: 'boolean' },
    help: { type: 'boolean' },
  },
})
if (values.help) {
  console.log(HELP)
  process.exit(0)
}

try {
  if (values.minimal) {
    await loadPeopleAndFloor()
    console.log(`seed: ${env.WAYMARK_DB}: demo people and stations loaded`)
  } else {
    const loaded = await loadDemo({ onlyIfEmpty: values['if-empty'] ?? false })
    console.log(
      `seed: ${env.WAYMARK_DB}: ${loaded ? 'demo scenario loaded' : 'already has data, left as it is'}`,
    )
  }
} finally {
  // The demo's step runs ask for alert checks as every recorded run does.
  await Promise.all([closeDb(), closeDocumentsQueue(), closeMailQueue(), closeAlertsQueue()])
}
// Nothing else should be left open, but a seed must never hang the start or test run.
process.exit(0)
