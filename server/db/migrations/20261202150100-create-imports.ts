import type { MigrationContext } from '../migrator'

// One uploaded bench file and its way through the dry run and the import job. The row is
// written before the job is enqueued, so a job lost while Redis was down is found again by the
// sweeper.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(
    `CREATE TYPE import_status AS ENUM ('uploaded', 'checked', 'queued', 'running', 'done', 'failed')`,
  )
  await sequelize.query(`
    CREATE TABLE imports (
      id uuid PRIMARY KEY,
      station_id uuid NOT NULL REFERENCES stations(id),
      upload_id uuid NOT NULL REFERENCES uploads(id),
      sha256 char(64) NOT NULL,
      filename varchar(200) NOT NULL,
      columns jsonb NOT NULL,
      row_count integer NOT NULL CHECK (row_count >= 0),
      status import_status NOT NULL DEFAULT 'uploaded',
      progress integer NOT NULL DEFAULT 0 CHECK (progress BETWEEN 0 AND 100),
      mapping jsonb NULL,
      defect_code_id uuid NULL REFERENCES defect_codes(id),
      ready_count integer NOT NULL DEFAULT 0,
      error_count integer NOT NULL DEFAULT 0,
      recorded_count integer NOT NULL DEFAULT 0,
      skipped_count integer NOT NULL DEFAULT 0,
      failed_count integer NOT NULL DEFAULT 0,
      error text NULL,
      created_by uuid NOT NULL REFERENCES users(id),
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL,
      checked_at timestamptz NULL,
      started_at timestamptz NULL,
      finished_at timestamptz NULL
    )`)
  // Serves the screen's list of recent imports of a station.
  await sequelize.query('CREATE INDEX imports_station_idx ON imports (station_id, created_at DESC)')
  // Serves the sweeper's search for imports whose job was lost.
  await sequelize.query(
    `CREATE INDEX imports_pending_idx ON imports (updated_at) WHERE status IN ('queued', 'running')`,
  )
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE imports')
  await sequelize.query('DROP TYPE import_status')
}
