import { DataTypes } from 'sequelize'
import type { MigrationContext } from '../migrator'

// The roles as this migration created them, written out: a migration must do the same thing
// on every database it ever runs on, so it never reads ROLES from shared/roles.ts, which may
// grow. A new role is a new migration that adds the value to enum_users_role.
const ROLES = ['admin', 'engineer', 'lead', 'operator', 'stores', 'service'] as const

export async function up({ context: { queryInterface } }: { context: MigrationContext }) {
  await queryInterface.createTable('users', {
    id: { type: DataTypes.UUID, primaryKey: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
    password_hash: { type: DataTypes.STRING(100), allowNull: false },
    is_active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    last_sign_in_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
  // Stored e-mails are lower-case (the zod schema folds them), so the unique index is enough.
  await queryInterface.sequelize.query(
    `ALTER TABLE users ADD CONSTRAINT users_email_lower CHECK (email = lower(email))`,
  )
}

export async function down({ context: { queryInterface } }: { context: MigrationContext }) {
  await queryInterface.dropTable('users')
  await queryInterface.sequelize.query('DROP TYPE IF EXISTS "enum_users_role"')
}
