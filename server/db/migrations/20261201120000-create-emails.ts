import type { MigrationContext } from '../migrator'

// E-mail the app sends, written in the transaction of the change that wants it, and the copies
// the local SMTP fake receives (status 'received'), so the Outbox shows both sides.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`CREATE TYPE email_status AS ENUM ('queued', 'sent', 'failed', 'received')`)
  await sequelize.query(`
    CREATE TABLE emails (
      id uuid PRIMARY KEY,
      direction varchar(8) NOT NULL DEFAULT 'out' CHECK (direction IN ('out')),
      status email_status NOT NULL DEFAULT 'queued',
      to_addresses text[] NOT NULL CHECK (cardinality(to_addresses) > 0),
      from_address varchar(320) NOT NULL,
      subject varchar(998) NOT NULL,
      text_body text NOT NULL,
      html_body text NULL,
      attachments jsonb NOT NULL DEFAULT '[]'::jsonb,
      message_id varchar(998) NULL,
      error text NULL,
      attempts integer NOT NULL DEFAULT 0 CHECK (attempts >= 0),
      related_entity varchar(64) NULL,
      related_id uuid NULL,
      created_by uuid NULL REFERENCES users(id),
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL,
      sent_at timestamptz NULL,
      CHECK ((related_entity IS NULL) = (related_id IS NULL))
    )`)
  // Serves the Outbox list: newest first, optionally filtered by status.
  await sequelize.query('CREATE INDEX emails_created_idx ON emails (created_at DESC)')
  await sequelize.query('CREATE INDEX emails_status_idx ON emails (status, created_at DESC)')
  // Serves the sweeper's search for rows whose job was lost while Redis was down.
  await sequelize.query(
    `CREATE INDEX emails_pending_idx ON emails (updated_at) WHERE status = 'queued'`,
  )
  // The fake files a message once, however often a retrying sender delivers it.
  await sequelize.query(
    `CREATE UNIQUE INDEX emails_received_message_idx ON emails (message_id) WHERE status = 'received'`,
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE emails')
  await sequelize.query('DROP TYPE email_status')
}
