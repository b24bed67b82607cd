import type { MigrationContext } from '../migrator'

// A second signature at the bench without typing an e-mail: each person may carry a badge (a
// random code printed as a QR, replaced each time one is printed) and set a short PIN, stored
// as a hash like a password. Both stay empty until the person asks for them.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    ALTER TABLE users
      ADD COLUMN badge_code varchar(32) NULL,
      ADD COLUMN pin_hash varchar(100) NULL,
      ADD COLUMN pin_set_at timestamptz NULL`)
  await sequelize.query('CREATE UNIQUE INDEX users_badge_code_key ON users (badge_code)')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    'ALTER TABLE users DROP COLUMN badge_code, DROP COLUMN pin_hash, DROP COLUMN pin_set_at',
  )
}
