import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  // Serves the yield aggregates (`lotUnitTotals`, `lotStepTotals` in yieldQueries.ts): the step
  // runs of a lot's units are read from the index alone, a nested loop of index-only scans,
  // instead of a sequential scan of every step run (measured by scripts/bench/yield.ts).
  await sequelize.query(
    'CREATE INDEX step_runs_unit_yield_idx ON step_runs (unit_id) INCLUDE (step_id, attempt, result, id)',
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP INDEX step_runs_unit_yield_idx')
}
