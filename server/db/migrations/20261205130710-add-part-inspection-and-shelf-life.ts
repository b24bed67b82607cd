import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  // A part that needs incoming inspection: its new lots wait quarantined until stores accept
  // them. A shelf life (days) suggests the expiry date of a part that ages when it is received.
  await sequelize.query(`
    ALTER TABLE parts
      ADD COLUMN needs_inspection boolean NOT NULL DEFAULT false,
      ADD COLUMN shelf_life_days integer NULL CHECK (shelf_life_days BETWEEN 1 AND 36500)`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    'ALTER TABLE parts DROP COLUMN needs_inspection, DROP COLUMN shelf_life_days',
  )
}
