import type { MigrationContext } from '../migrator'

/**
 * Trigram indexes for the global search (`server/services/search/searchSql.ts`): each serves
 * `<column> ILIKE '%text%'` on its table. Products and customers' e-mails are a few dozen rows
 * and are read whole; service cases and shipments grow with every return and shipment.
 */
const INDEXES = [
  ['units_serial_trgm_idx', 'units', 'serial'],
  ['lots_number_trgm_idx', 'lots', 'number'],
  ['lots_order_ref_trgm_idx', 'lots', 'order_ref'],
  ['component_lots_internal_code_trgm_idx', 'component_lots', 'internal_code'],
  ['component_lots_supplier_lot_code_trgm_idx', 'component_lots', 'supplier_lot_code'],
  ['customers_name_trgm_idx', 'customers', 'name'],
  ['shipments_number_trgm_idx', 'shipments', 'number'],
  ['shipments_order_ref_trgm_idx', 'shipments', 'order_ref'],
  ['shipments_tracking_trgm_idx', 'shipments', 'tracking'],
  ['service_cases_number_trgm_idx', 'service_cases', 'number'],
] as const

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  for (const [name, table, column] of INDEXES)
    await sequelize.query(`CREATE INDEX ${name} ON ${table} USING gin (${column} gin_trgm_ops)`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  for (const [name] of INDEXES) await sequelize.query(`DROP INDEX ${name}`)
}
