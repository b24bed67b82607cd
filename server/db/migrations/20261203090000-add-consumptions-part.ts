import type { MigrationContext } from '../migrator'

// A serial-traced part's serial is unique per part, not per component lot: one board serial
// must not be fitted to two units because it was scanned from two lots of the same part. The
// part is the component lot's, copied onto each consumption so that a unique index can hold it
// (next migration). A component lot never changes its part, so the copy cannot go stale.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    'ALTER TABLE consumptions ADD COLUMN part_id uuid NULL REFERENCES parts(id)',
  )
  await sequelize.query(
    `UPDATE consumptions c SET part_id = cl.part_id
       FROM component_lots cl WHERE cl.id = c.component_lot_id`,
  )
  await sequelize.query('ALTER TABLE consumptions ALTER COLUMN part_id SET NOT NULL')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('ALTER TABLE consumptions DROP COLUMN part_id')
}
