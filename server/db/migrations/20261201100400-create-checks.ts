import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`CREATE TYPE check_kind AS ENUM ('numeric', 'boolean', 'text', 'choice')`)
  await sequelize.query(`
    CREATE TABLE checks (
      id uuid PRIMARY KEY,
      revision_id uuid NOT NULL REFERENCES revisions(id) ON DELETE CASCADE,
      step_id uuid NOT NULL REFERENCES route_steps(id) ON DELETE CASCADE,
      position integer NOT NULL,
      key varchar(40) NOT NULL CHECK (key ~ '^[a-z][a-z0-9_]*$'),
      label varchar(120) NOT NULL,
      kind check_kind NOT NULL,
      unit varchar(8) NULL,
      nominal double precision NULL,
      lower double precision NULL,
      upper double precision NULL,
      decimals integer NOT NULL DEFAULT 2 CHECK (decimals BETWEEN 0 AND 6),
      choices jsonb NULL,
      derived varchar(40) NULL,
      derived_inputs jsonb NULL,
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL,
      -- A key names one measurement across the whole revision (exports, derived inputs).
      UNIQUE (revision_id, key),
      CHECK (lower IS NULL OR upper IS NULL OR lower <= upper)
    )`)
  // Serves loading a step's checks in order.
  await sequelize.query('CREATE INDEX checks_step_idx ON checks (step_id, position)')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE checks')
  await sequelize.query('DROP TYPE check_kind')
}
