import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE parts (
      id uuid PRIMARY KEY,
      part_number varchar(40) NOT NULL UNIQUE,
      description varchar(200) NOT NULL,
      unit_of_measure varchar(8) NOT NULL DEFAULT 'pcs',
      has_expiry boolean NOT NULL DEFAULT false,
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    )`)
  // Serves the parts search box (substring match on the description).
  await sequelize.query('CREATE INDEX parts_description_idx ON parts (lower(description))')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE parts')
}
