import type { MigrationContext } from '../migrator'

// Customers, shipments of finished units, and service cases for units that come back
// (DESIGN.md §4). A lot may name its customer by link; the free-text name stays for old lots.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE customers (
      id uuid PRIMARY KEY,
      name varchar(120) NOT NULL,
      contact_email varchar(320) NOT NULL DEFAULT '',
      address text NOT NULL DEFAULT '',
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    )`)
  // Names are unique regardless of case, so a lot's typed customer name finds one row.
  await sequelize.query('CREATE UNIQUE INDEX customers_name_idx ON customers (lower(name))')
  await sequelize.query(
    'ALTER TABLE lots ADD COLUMN customer_id uuid NULL REFERENCES customers(id)',
  )
  await sequelize.query('CREATE INDEX lots_customer_idx ON lots (customer_id)')

  await sequelize.query(`
    CREATE TABLE shipments (
      id uuid PRIMARY KEY,
      number varchar(20) NOT NULL UNIQUE,
      customer_id uuid NOT NULL REFERENCES customers(id),
      order_ref varchar(80) NOT NULL DEFAULT '',
      carrier varchar(80) NOT NULL DEFAULT '',
      tracking varchar(120) NOT NULL DEFAULT '',
      shipped_on date NOT NULL,
      created_by uuid NULL REFERENCES users(id),
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    )`)
  // Numbers generated shipments (S-0001, S-0002 …).
  await sequelize.query('CREATE SEQUENCE shipment_number_seq')
  await sequelize.query(
    'CREATE INDEX shipments_customer_idx ON shipments (customer_id, shipped_on DESC)',
  )
  // A unit leaves once: the unit id is the key.
  await sequelize.query(`
    CREATE TABLE shipment_units (
      unit_id uuid PRIMARY KEY REFERENCES units(id),
      shipment_id uuid NOT NULL REFERENCES shipments(id),
      created_at timestamptz NOT NULL
    )`)
  await sequelize.query('CREATE INDEX shipment_units_shipment_idx ON shipment_units (shipment_id)')

  await sequelize.query(`CREATE TYPE service_case_status AS ENUM ('open', 'closed')`)
  await sequelize.query(
    `CREATE TYPE service_case_resolution AS ENUM ('repair', 'replace', 'credit', 'no_fault_found')`,
  )
  await sequelize.query(`
    CREATE TABLE service_cases (
      id uuid PRIMARY KEY,
      number varchar(20) NOT NULL UNIQUE,
      unit_id uuid NOT NULL REFERENCES units(id),
      customer_id uuid NULL REFERENCES customers(id),
      complaint text NOT NULL,
      received_on date NOT NULL,
      findings text NOT NULL DEFAULT '',
      defect_code_id uuid NULL REFERENCES defect_codes(id),
      resolution service_case_resolution NULL,
      replacement_unit_id uuid NULL REFERENCES units(id),
      status service_case_status NOT NULL DEFAULT 'open',
      opened_by uuid NULL REFERENCES users(id),
      closed_by uuid NULL REFERENCES users(id),
      closed_at timestamptz NULL,
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL,
      CHECK ((status = 'closed') = (closed_at IS NOT NULL)),
      CHECK (status = 'open' OR resolution IS NOT NULL)
    )`)
  await sequelize.query('CREATE SEQUENCE service_case_number_seq')
  await sequelize.query('CREATE INDEX service_cases_unit_idx ON service_cases (unit_id)')
  // One open case per unit at a time.
  await sequelize.query(
    `CREATE UNIQUE INDEX service_cases_open_unit_idx ON service_cases (unit_id) WHERE status = 'open'`,
  )
  // Drafts: messages prepared for a person to review before they are queued (recall letters).
  await sequelize.query(`ALTER TYPE email_status ADD VALUE IF NOT EXISTS 'draft' BEFORE 'queued'`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE service_cases')
  await sequelize.query('DROP SEQUENCE service_case_number_seq')
  await sequelize.query('DROP TYPE service_case_resolution')
  await sequelize.query('DROP TYPE service_case_status')
  await sequelize.query('DROP TABLE shipment_units')
  await sequelize.query('DROP TABLE shipments')
  await sequelize.query('DROP SEQUENCE shipment_number_seq')
  await sequelize.query('ALTER TABLE lots DROP COLUMN customer_id')
  await sequelize.query('DROP TABLE customers')
}
