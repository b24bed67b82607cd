import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE consumptions (
      id uuid PRIMARY KEY,
      unit_id uuid NOT NULL REFERENCES units(id),
      component_lot_id uuid NOT NULL REFERENCES component_lots(id),
      bom_line_id uuid NOT NULL REFERENCES bom_lines(id),
      step_run_id uuid NOT NULL REFERENCES step_runs(id),
      quantity double precision NOT NULL CHECK (quantity > 0),
      item_serial varchar(80) NULL,
      created_at timestamptz NOT NULL,
      -- A serial-traced item is fitted to one unit only.
      UNIQUE (component_lot_id, item_serial)
    )`)
  // Serves the recall scope of a component lot and the genealogy of a unit.
  await sequelize.query('CREATE INDEX consumptions_lot_idx ON consumptions (component_lot_id)')
  await sequelize.query('CREATE INDEX consumptions_unit_idx ON consumptions (unit_id)')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE consumptions')
}
