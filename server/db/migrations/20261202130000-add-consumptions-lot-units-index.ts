import type { MigrationContext } from '../migrator'

// Serves the recall scope (RECALL_SCOPE_SQL): every unit holding a component lot, with the
// quantity fitted, read from the index alone instead of one heap page per few consumptions.
// It leads with component_lot_id, so it also serves everything consumptions_lot_idx did.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    'CREATE INDEX consumptions_lot_units_idx ON consumptions (component_lot_id) INCLUDE (unit_id, quantity)',
  )
  await sequelize.query('DROP INDEX consumptions_lot_idx')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('CREATE INDEX consumptions_lot_idx ON consumptions (component_lot_id)')
  await sequelize.query('DROP INDEX consumptions_lot_units_idx')
}
