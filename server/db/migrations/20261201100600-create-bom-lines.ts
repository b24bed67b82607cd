import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`CREATE TYPE trace_level AS ENUM ('lot', 'serial')`)
  await sequelize.query(`
    CREATE TABLE bom_lines (
      id uuid PRIMARY KEY,
      revision_id uuid NOT NULL REFERENCES revisions(id) ON DELETE CASCADE,
      part_id uuid NOT NULL REFERENCES parts(id),
      quantity double precision NOT NULL CHECK (quantity > 0),
      ref_designators varchar(400) NOT NULL DEFAULT '',
      fitted_at_step_id uuid NULL REFERENCES route_steps(id) ON DELETE SET NULL,
      trace_level trace_level NOT NULL DEFAULT 'lot',
      position integer NOT NULL,
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    )`)
  // Serves a revision's bill of materials and "which parts are fitted at this step".
  await sequelize.query('CREATE INDEX bom_lines_revision_idx ON bom_lines (revision_id, position)')
  await sequelize.query('CREATE INDEX bom_lines_step_idx ON bom_lines (fitted_at_step_id)')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE bom_lines')
  await sequelize.query('DROP TYPE trace_level')
}
