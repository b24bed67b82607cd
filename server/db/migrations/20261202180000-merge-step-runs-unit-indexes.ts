import type { MigrationContext } from '../migrator'

// Every scan inserts a step run, and each of step_runs' indexes is one more write per scan.
// Three of them led with unit_id: the (unit, step, attempt) constraint, (unit, finished_at) for
// the trace, and (unit) INCLUDE (step, attempt, result, id) for the yield aggregates. One unique
// index (unit, step, attempt) INCLUDE (result, id, finished_at) serves all three: the constraint,
// the yield and lot-grid aggregates as index-only scans, and the trace, which reads a unit's few
// runs and sorts them. Checked with scripts/bench/yield.ts, trace.ts and scan.ts.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    `CREATE UNIQUE INDEX step_runs_unit_step_attempt_idx
       ON step_runs (unit_id, step_id, attempt) INCLUDE (result, id, finished_at)`,
  )
  await sequelize.query(
    `ALTER TABLE step_runs
       DROP CONSTRAINT step_runs_unit_id_step_id_attempt_key,
       ADD CONSTRAINT step_runs_unit_id_step_id_attempt_key
         UNIQUE USING INDEX step_runs_unit_step_attempt_idx`,
  )
  await sequelize.query('DROP INDEX step_runs_unit_idx')
  await sequelize.query('DROP INDEX step_runs_unit_yield_idx')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('CREATE INDEX step_runs_unit_idx ON step_runs (unit_id, finished_at)')
  await sequelize.query(
    'CREATE INDEX step_runs_unit_yield_idx ON step_runs (unit_id) INCLUDE (step_id, attempt, result, id)',
  )
  await sequelize.query(
    `ALTER TABLE step_runs
       DROP CONSTRAINT step_runs_unit_id_step_id_attempt_key,
       ADD CONSTRAINT step_runs_unit_id_step_id_attempt_key UNIQUE (unit_id, step_id, attempt)`,
  )
}
