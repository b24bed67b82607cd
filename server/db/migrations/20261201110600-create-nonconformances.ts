import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`CREATE TYPE disposition AS ENUM ('rework', 'scrap', 'use_as_is')`)
  await sequelize.query(`
    CREATE TABLE nonconformances (
      id uuid PRIMARY KEY,
      unit_id uuid NOT NULL REFERENCES units(id),
      step_run_id uuid NOT NULL UNIQUE REFERENCES step_runs(id),
      defect_code_id uuid NULL REFERENCES defect_codes(id),
      description text NOT NULL DEFAULT '',
      failed_checks jsonb NOT NULL DEFAULT '[]',
      disposition disposition NULL,
      rework_to_step_id uuid NULL REFERENCES route_steps(id),
      reason text NOT NULL DEFAULT '',
      opened_by uuid NULL REFERENCES users(id),
      decided_by uuid NULL REFERENCES users(id),
      countersigned_by uuid NULL REFERENCES users(id),
      opened_at timestamptz NOT NULL,
      closed_at timestamptz NULL
    )`)
  // Serves the list of open nonconformances (the lead's queue) and a unit's history.
  await sequelize.query(
    'CREATE INDEX nonconformances_open_idx ON nonconformances (opened_at) WHERE closed_at IS NULL',
  )
  await sequelize.query('CREATE INDEX nonconformances_unit_idx ON nonconformances (unit_id)')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE nonconformances')
  await sequelize.query('DROP TYPE disposition')
}
