import type { MigrationContext } from '../migrator'

// Certificates and packing slips belong to a shipment rather than a lot.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    'ALTER TABLE documents ADD COLUMN shipment_id uuid NULL REFERENCES shipments(id)',
  )
  await sequelize.query(
    'CREATE INDEX documents_shipment_idx ON documents (shipment_id, created_at DESC)',
  )
  await sequelize.query('CREATE INDEX documents_unit_idx ON documents (unit_id, created_at DESC)')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('ALTER TABLE documents DROP COLUMN shipment_id')
  await sequelize.query('DROP INDEX documents_unit_idx')
}
