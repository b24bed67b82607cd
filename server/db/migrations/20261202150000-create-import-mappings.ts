import type { MigrationContext } from '../migrator'

// How a station's bench files map onto check keys: saved once per station and reused for
// every later file from that rack.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE import_mappings (
      station_id uuid PRIMARY KEY REFERENCES stations(id),
      serial_column varchar(200) NOT NULL,
      time_column varchar(200) NULL,
      operator_column varchar(200) NULL,
      check_columns jsonb NOT NULL DEFAULT '{}'::jsonb,
      updated_by uuid NULL REFERENCES users(id),
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    )`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE import_mappings')
}
