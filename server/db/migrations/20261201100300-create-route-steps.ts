import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE route_steps (
      id uuid PRIMARY KEY,
      revision_id uuid NOT NULL REFERENCES revisions(id) ON DELETE CASCADE,
      position integer NOT NULL CHECK (position >= 1),
      name varchar(80) NOT NULL,
      station_kind "enum_stations_kind" NOT NULL,
      instructions text NOT NULL DEFAULT '',
      safety_note text NOT NULL DEFAULT '',
      requires_signoff boolean NOT NULL DEFAULT false,
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL,
      -- Deferred so that a reorder can renumber every step inside one transaction.
      CONSTRAINT route_steps_position_unique UNIQUE (revision_id, position) DEFERRABLE INITIALLY DEFERRED
    )`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE route_steps')
}
