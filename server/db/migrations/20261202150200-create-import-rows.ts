import type { MigrationContext } from '../migrator'

// Each data row of an imported file: what the dry run found (the unit, the step, the typed
// values and their verdicts, or the row's errors) and, after the import, what became of it.
// `client_event_id` is derived from the file's sha256 and the row number, so the same row of
// the same file always submits the same step-run event.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`CREATE TYPE import_row_outcome AS ENUM ('recorded', 'repeat', 'refused')`)
  await sequelize.query(`
    CREATE TABLE import_rows (
      import_id uuid NOT NULL REFERENCES imports(id) ON DELETE CASCADE,
      row_number integer NOT NULL,
      client_event_id uuid NOT NULL,
      serial varchar(200) NOT NULL DEFAULT '',
      unit_id uuid NULL REFERENCES units(id),
      step_id uuid NULL REFERENCES route_steps(id),
      step_name varchar(200) NULL,
      bench_time varchar(100) NULL,
      bench_operator varchar(100) NULL,
      "values" jsonb NOT NULL DEFAULT '{}'::jsonb,
      checks jsonb NOT NULL DEFAULT '[]'::jsonb,
      result varchar(4) NULL CHECK (result IN ('pass', 'fail')),
      errors jsonb NOT NULL DEFAULT '[]'::jsonb,
      outcome import_row_outcome NULL,
      outcome_message text NULL,
      step_run_id uuid NULL REFERENCES step_runs(id),
      PRIMARY KEY (import_id, row_number)
    )`)
  // The primary key serves the row list (by import, in file order) and the job's walk.
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE import_rows')
  await sequelize.query('DROP TYPE import_row_outcome')
}
