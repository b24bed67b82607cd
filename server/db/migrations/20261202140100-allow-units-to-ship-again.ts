import type { MigrationContext } from '../migrator'

// A returned unit that is repaired passes its route again and goes back to the customer, so a
// unit may appear in more than one shipment (never twice in the same one). Its latest shipment
// is where it is now.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('ALTER TABLE shipment_units DROP CONSTRAINT shipment_units_pkey')
  await sequelize.query(
    'ALTER TABLE shipment_units ADD CONSTRAINT shipment_units_pkey PRIMARY KEY (unit_id, shipment_id)',
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('ALTER TABLE shipment_units DROP CONSTRAINT shipment_units_pkey')
  await sequelize.query(
    'ALTER TABLE shipment_units ADD CONSTRAINT shipment_units_pkey PRIMARY KEY (unit_id)',
  )
}
