import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`CREATE TYPE step_result AS ENUM ('pass', 'fail')`)
  await sequelize.query(`
    CREATE TABLE step_runs (
      id uuid PRIMARY KEY,
      unit_id uuid NOT NULL REFERENCES units(id),
      step_id uuid NOT NULL REFERENCES route_steps(id),
      station_id uuid NOT NULL REFERENCES stations(id),
      operator_id uuid NOT NULL REFERENCES users(id),
      countersigned_by uuid NULL REFERENCES users(id),
      attempt integer NOT NULL CHECK (attempt >= 1),
      is_rework boolean NOT NULL DEFAULT false,
      result step_result NOT NULL,
      note text NOT NULL DEFAULT '',
      -- The id the client made for this submission: a retry or a double scan carries the same
      -- one, and this constraint is what makes recording it happen exactly once.
      client_event_id uuid NOT NULL UNIQUE,
      started_at timestamptz NOT NULL,
      finished_at timestamptz NOT NULL,
      UNIQUE (unit_id, step_id, attempt)
    )`)
  // Serves yield per step and the trace of a unit in time order.
  await sequelize.query('CREATE INDEX step_runs_step_idx ON step_runs (step_id, attempt, result)')
  await sequelize.query('CREATE INDEX step_runs_unit_idx ON step_runs (unit_id, finished_at)')
  // Serves the Floor's "recent at this station" list.
  await sequelize.query(
    'CREATE INDEX step_runs_station_idx ON step_runs (station_id, finished_at DESC)',
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE step_runs')
  await sequelize.query('DROP TYPE step_result')
}
