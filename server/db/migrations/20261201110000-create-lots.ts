import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    `CREATE TYPE lot_status AS ENUM ('planned', 'released', 'in_progress', 'closed')`,
  )
  // Numbers generated lot numbers (L-0001, L-0002 …); typed numbers skip it.
  await sequelize.query('CREATE SEQUENCE lot_number_seq')
  await sequelize.query(`
    CREATE TABLE lots (
      id uuid PRIMARY KEY,
      number varchar(20) NOT NULL UNIQUE,
      revision_id uuid NOT NULL REFERENCES revisions(id),
      quantity integer NOT NULL CHECK (quantity BETWEEN 1 AND 2000),
      order_ref varchar(80) NOT NULL DEFAULT '',
      customer_name varchar(120) NOT NULL DEFAULT '',
      due_date date NULL,
      status lot_status NOT NULL DEFAULT 'planned',
      is_on_hold boolean NOT NULL DEFAULT false,
      hold_reason varchar(500) NOT NULL DEFAULT '',
      released_at timestamptz NULL,
      closed_at timestamptz NULL,
      created_by uuid NULL REFERENCES users(id),
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    )`)
  // Serves the lot list, newest first.
  await sequelize.query('CREATE INDEX lots_created_idx ON lots (created_at DESC)')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE lots')
  await sequelize.query('DROP SEQUENCE lot_number_seq')
  await sequelize.query('DROP TYPE lot_status')
}
