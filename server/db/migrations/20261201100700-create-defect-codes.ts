import type { MigrationContext } from '../migrator'

// The station kinds a defect code could name when this migration ran, written out: a migration
// must do the same thing on every database it ever runs on, so it never reads STATION_KINDS
// from shared/stations.ts, which may grow. A new kind is a new migration that replaces the CHECK.
const STATION_KINDS = [
  'winding',
  'soldering',
  'hipot',
  'load_test',
  'inspection',
  'packing',
  'other',
] as const

export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE TABLE defect_codes (
      id uuid PRIMARY KEY,
      code varchar(16) NOT NULL UNIQUE,
      description varchar(200) NOT NULL,
      station_kinds varchar(16)[] NOT NULL
        CHECK (cardinality(station_kinds) > 0 AND station_kinds <@ ARRAY[${STATION_KINDS.map((k) => `'${k}'`).join(', ')}]::varchar[]),
      is_active boolean NOT NULL DEFAULT true,
      created_at timestamptz NOT NULL,
      updated_at timestamptz NOT NULL
    )`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE defect_codes')
}
