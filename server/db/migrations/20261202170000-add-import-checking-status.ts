import type { MigrationContext } from '../migrator'

// The dry run of a bench file became a job on the imports queue (a 20 MB file has a few
// hundred thousand rows, too many for one request): an import is `checking` while it runs.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    `ALTER TYPE import_status ADD VALUE IF NOT EXISTS 'checking' AFTER 'uploaded'`,
  )
}

// PostgreSQL cannot drop one value of an enum; the down step leaves it unused.
export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`UPDATE imports SET status = 'uploaded' WHERE status = 'checking'`)
}
