import type { MigrationContext } from '../migrator'

// The local mail fake's copy of a message the app sent is a delivery receipt on the sent row,
// matched by Message-ID, not a row of its own: the Outbox shows each message once.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`ALTER TABLE emails ADD COLUMN receipt_at timestamptz NULL`)
  // Serves the fake's match of a filed message to the row that sent it.
  await sequelize.query(
    `CREATE INDEX emails_sent_message_idx ON emails (message_id) WHERE status <> 'received'`,
  )
  // Copies filed before this change: mark their sent rows; the list hides such copies.
  await sequelize.query(`
    UPDATE emails o SET receipt_at = r.created_at
      FROM emails r
     WHERE r.status = 'received' AND o.status <> 'received' AND r.message_id = o.message_id`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP INDEX emails_sent_message_idx')
  await sequelize.query('ALTER TABLE emails DROP COLUMN receipt_at')
}
