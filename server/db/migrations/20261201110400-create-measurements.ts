import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE measurements (
      id bigserial PRIMARY KEY,
      step_run_id uuid NOT NULL REFERENCES step_runs(id),
      check_id uuid NOT NULL REFERENCES checks(id),
      value_number double precision NULL,
      value_text text NULL,
      value_boolean boolean NULL,
      is_derived boolean NOT NULL DEFAULT false,
      is_pass boolean NOT NULL,
      UNIQUE (step_run_id, check_id)
    )`)
  // Serves capability and control charts of one check across units.
  await sequelize.query('CREATE INDEX measurements_check_idx ON measurements (check_id)')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE measurements')
}
