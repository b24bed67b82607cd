import type { MigrationContext } from '../migrator'

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  // A lot received for a part that needs incoming inspection waits (quarantined) until stores
  // accept or reject it; who decided, when and the note they wrote stay on the lot.
  await sequelize.query(`
    ALTER TABLE component_lots
      ADD COLUMN awaits_inspection boolean NOT NULL DEFAULT false,
      ADD COLUMN inspected_at timestamptz NULL,
      ADD COLUMN inspected_by uuid NULL REFERENCES users(id),
      ADD COLUMN inspection_note text NOT NULL DEFAULT ''`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    ALTER TABLE component_lots
      DROP COLUMN awaits_inspection, DROP COLUMN inspected_at,
      DROP COLUMN inspected_by, DROP COLUMN inspection_note`)
}
