import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  // Serves the Yield board's "lots with a step run in the period" (`lotsRunInPeriod`): a range
  // scan on finished_at that reads unit_id from the index alone.
  await sequelize.query(
    'CREATE INDEX step_runs_finished_idx ON step_runs (finished_at) INCLUDE (unit_id)',
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP INDEX step_runs_finished_idx')
}
