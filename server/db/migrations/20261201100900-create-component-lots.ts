import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    `CREATE TYPE component_lot_status AS ENUM ('available', 'quarantined', 'used_up', 'rejected')`,
  )
  // Numbers the internal lot codes; a sequence never hands out a number twice, even under load.
  await sequelize.query('CREATE SEQUENCE component_lot_code_seq')
  await sequelize.query(`
    CREATE TABLE component_lots (
      id uuid PRIMARY KEY,
      internal_code varchar(20) NOT NULL UNIQUE,
      part_id uuid NOT NULL REFERENCES parts(id),
      supplier_name varchar(120) NOT NULL,
      supplier_lot_code varchar(80) NOT NULL,
      quantity_received double precision NOT NULL CHECK (quantity_received > 0),
      quantity_remaining double precision NOT NULL CHECK (quantity_remaining >= 0),
      received_on date NOT NULL,
      expires_on date NULL,
      status component_lot_status NOT NULL DEFAULT 'available',
      notes text NOT NULL DEFAULT '',
      certificate_upload_id uuid NULL REFERENCES uploads(id),
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    )`)
  // Serves the Receiving list filtered by part and status, newest first.
  await sequelize.query(
    'CREATE INDEX component_lots_part_idx ON component_lots (part_id, received_on DESC)',
  )
  await sequelize.query(
    'CREATE INDEX component_lots_status_idx ON component_lots (status, received_on DESC)',
  )
  // Serves the search box on the supplier's lot code.
  await sequelize.query(
    'CREATE INDEX component_lots_supplier_code_idx ON component_lots (lower(supplier_lot_code))',
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE component_lots')
  await sequelize.query('DROP SEQUENCE component_lot_code_seq')
  await sequelize.query('DROP TYPE component_lot_status')
}
