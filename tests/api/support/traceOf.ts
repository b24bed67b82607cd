import { closeDb } from '../../../server/models'
import { traceUnit } from '../../../server/services/trace/trace'

// Prints the trace service's answer for one serial, computed against the database WAYMARK_DB
// names: the backup test runs it against a restored copy, in a process of its own.
try {
  process.stdout.write(JSON.stringify(await traceUnit(process.argv[2] ?? '')))
} finally {
  await closeDb()
}
