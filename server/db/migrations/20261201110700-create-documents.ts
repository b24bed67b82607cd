import type { MigrationContext } from '../migrator'

// Generated PDFs. The row is written in the same transaction as the request that wants the
// document, so a job lost while Redis was down is found and enqueued again by the sweeper.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    `CREATE TYPE document_status AS ENUM ('queued', 'running', 'done', 'failed')`,
  )
  await sequelize.query(`
    CREATE TABLE documents (
      id uuid PRIMARY KEY,
      kind varchar(20) NOT NULL,
      lot_id uuid NULL REFERENCES lots(id),
      unit_id uuid NULL REFERENCES units(id),
      layout varchar(20) NULL,
      status document_status NOT NULL DEFAULT 'queued',
      progress integer NOT NULL DEFAULT 0 CHECK (progress BETWEEN 0 AND 100),
      filename varchar(200) NOT NULL,
      storage_key varchar(200) NULL,
      sha256 char(64) NULL,
      size integer NULL,
      error text NULL,
      created_by uuid NULL REFERENCES users(id),
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL,
      finished_at timestamptz NULL
    )`)
  // Serves a lot's documents list and the sweeper's search for queued rows.
  await sequelize.query('CREATE INDEX documents_lot_idx ON documents (lot_id, created_at DESC)')
  await sequelize.query(
    `CREATE INDEX documents_pending_idx ON documents (updated_at) WHERE status IN ('queued', 'running')`,
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE documents')
  await sequelize.query('DROP TYPE document_status')
}
