import type { MigrationContext } from '../migrator'

// The table connect-pg-simple reads and writes; created here because the app role may not run DDL.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE sessions (
      sid varchar NOT NULL PRIMARY KEY,
      sess json NOT NULL,
      expire timestamp(6) NOT NULL
    )`)
  // Serves the sweep of expired sessions (workers/maintenance.ts).
  await sequelize.query('CREATE INDEX sessions_expire_idx ON sessions (expire)')
  // Serves "end every session of this user" when an admin deactivates an account.
  await sequelize.query(
    `CREATE INDEX sessions_user_idx ON sessions ((sess -> 'passport' ->> 'user'))`,
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE sessions')
}
