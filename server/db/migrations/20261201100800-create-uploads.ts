import type { MigrationContext } from '../migrator'

// Files kept in the object store; the row holds what the store does not (name, who, when).
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE uploads (
      id uuid PRIMARY KEY,
      storage_key varchar(200) NOT NULL,
      sha256 char(64) NOT NULL,
      filename varchar(200) NOT NULL,
      content_type varchar(100) NOT NULL,
      size integer NOT NULL,
      uploaded_by uuid NULL REFERENCES users(id),
      created_at timestamptz NOT NULL
    )`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE uploads')
}
