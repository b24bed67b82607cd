import { STATION_KINDS } from '../../../shared/stations'
import type { MigrationContext } from '../migrator'

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
