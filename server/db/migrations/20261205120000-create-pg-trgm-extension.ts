import type { MigrationContext } from '../migrator'

// pg_trgm (PostgreSQL contrib) indexes text by its three-letter pieces, so `ILIKE '%…%'` can use
// an index: the top bar's search finds a serial, lot or code from any part of it. It is a trusted
// extension since PostgreSQL 13, so the database's owner may create it without a superuser.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('CREATE EXTENSION IF NOT EXISTS pg_trgm')
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP EXTENSION IF EXISTS pg_trgm')
}
