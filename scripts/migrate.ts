import { parseArgs } from 'node:util'
import { migrator, ownerConnection, resetTestSchema } from '../server/db/migrator'
import { env } from '../server/env'

const HELP = `Usage: tsx scripts/migrate.ts [--reset] [--down]

Runs the pending migrations of server/db/migrations on the database named by WAYMARK_DB
(default waymark), connected as the owner role.
  --reset  drop and recreate the schema first (only for a database whose name ends in _test)
  --down   undo the most recent migration`

const { values } = parseArgs({
  options: { reset: { type: 'boolean' }, down: { type: 'boolean' }, help: { type: 'boolean' } },
})
if (values.help) {
  console.log(HELP)
  process.exit(0)
}

const sequelize = ownerConnection()
try {
  if (values.reset) await resetTestSchema(sequelize)
  const umzug = migrator(sequelize)
  const ran = values.down ? await umzug.down() : await umzug.up()
  console.log(
    `migrate: ${env.WAYMARK_DB}: ${values.down ? 'undid' : 'applied'} ${ran.length} migration(s)`,
  )
} finally {
  await sequelize.close()
}
