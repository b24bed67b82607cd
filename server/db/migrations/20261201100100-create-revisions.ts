import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`CREATE TYPE revision_status AS ENUM ('draft', 'released', 'obsolete')`)
  await sequelize.query(`
    CREATE TABLE revisions (
      id uuid PRIMARY KEY,
      product_id uuid NOT NULL REFERENCES products(id),
      letter varchar(3) NOT NULL CHECK (letter ~ '^[A-Z]{1,3}$'),
      status revision_status NOT NULL DEFAULT 'draft',
      notes text NOT NULL DEFAULT '',
      fpy_threshold_percent double precision NOT NULL DEFAULT 90 CHECK (fpy_threshold_percent BETWEEN 0 AND 100),
      copied_from_id uuid NULL REFERENCES revisions(id),
      released_at timestamptz NULL,
      released_by uuid NULL REFERENCES users(id),
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL,
      UNIQUE (product_id, letter)
    )`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE revisions')
  await sequelize.query('DROP TYPE revision_status')
}
