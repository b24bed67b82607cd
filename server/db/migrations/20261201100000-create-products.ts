import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE products (
      id uuid PRIMARY KEY,
      code varchar(6) NOT NULL UNIQUE CHECK (code ~ '^[A-Z0-9]{2,6}$'),
      name varchar(80) NOT NULL,
      description text NOT NULL DEFAULT '',
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    )`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE products')
}
