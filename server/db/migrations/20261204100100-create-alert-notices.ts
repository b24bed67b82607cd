import type { MigrationContext } from '../migrator'

// Which lead was told of which alert, and by which e-mail: an episode's own message when the
// lead had no alert e-mail in the digest window, else a digest that gathers what came since
// (at most one per window per lead). A notice with no e-mail yet waits for that digest.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE alert_notices (
      alert_id uuid NOT NULL REFERENCES alerts(id),
      user_id uuid NOT NULL REFERENCES users(id),
      email_id uuid NULL REFERENCES emails(id),
      is_digest boolean NOT NULL DEFAULT false,
      created_at timestamptz NOT NULL,
      mailed_at timestamptz NULL,
      PRIMARY KEY (alert_id, user_id),
      CHECK ((email_id IS NULL) = (mailed_at IS NULL))
    )`)
  // Serves the digest's search for a lead's waiting notices and the sweep for leads with any.
  await sequelize.query(
    `CREATE INDEX alert_notices_waiting_idx ON alert_notices (user_id, created_at)
      WHERE email_id IS NULL`,
  )
  // Serves "when did this lead last get an alert e-mail".
  await sequelize.query(
    `CREATE INDEX alert_notices_mailed_idx ON alert_notices (user_id, mailed_at DESC)
      WHERE mailed_at IS NOT NULL`,
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE alert_notices')
}
