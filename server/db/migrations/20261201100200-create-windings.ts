import type { MigrationContext } from '../migrator'

// Magnetics data of a revision: one row per winding of its transformer.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE windings (
      id uuid PRIMARY KEY,
      revision_id uuid NOT NULL REFERENCES revisions(id) ON DELETE CASCADE,
      position integer NOT NULL,
      name varchar(40) NOT NULL,
      nominal_turns integer NOT NULL CHECK (nominal_turns > 0),
      al_nano_henry double precision NOT NULL CHECK (al_nano_henry > 0),
      al_tolerance_percent double precision NOT NULL DEFAULT 25,
      core_area_mm2 double precision NULL,
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL,
      UNIQUE (revision_id, name)
    )`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE windings')
}
