import type { MigrationContext } from '../migrator'

// The app runs as its own role with data rights only; the owner role that runs migrations keeps
// DDL. Default privileges make every table created later readable and writable by the app role.
export async function up({ context: { sequelize, appRole } }: { context: MigrationContext }) {
  const role = `"${appRole.replace(/"/g, '""')}"`
  await sequelize.query(`GRANT USAGE ON SCHEMA public TO ${role}`)
  // Sequelize's findOrCreate inside a transaction writes a pg_temp function.
  await sequelize.query(
    `DO $$ BEGIN EXECUTE format('GRANT TEMPORARY ON DATABASE %I TO ${role}', current_database()); END $$`,
  )
  await sequelize.query(
    `ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO ${role}`,
  )
  await sequelize.query(
    `ALTER DEFAULT PRIVILEGES IN SCHEMA public GRANT USAGE, SELECT ON SEQUENCES TO ${role}`,
  )
}

export async function down({ context: { sequelize, appRole } }: { context: MigrationContext }) {
  const role = `"${appRole.replace(/"/g, '""')}"`
  await sequelize.query(
    `ALTER DEFAULT PRIVILEGES IN SCHEMA public REVOKE ALL ON SEQUENCES FROM ${role}`,
  )
  await sequelize.query(
    `ALTER DEFAULT PRIVILEGES IN SCHEMA public REVOKE ALL ON TABLES FROM ${role}`,
  )
  await sequelize.query(
    `DO $$ BEGIN EXECUTE format('REVOKE TEMPORARY ON DATABASE %I FROM ${role}', current_database()); END $$`,
  )
  await sequelize.query(`REVOKE USAGE ON SCHEMA public FROM ${role}`)
}
