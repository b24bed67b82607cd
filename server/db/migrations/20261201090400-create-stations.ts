import { DataTypes } from 'sequelize'
import type { MigrationContext } from '../migrator'

// The station kinds as this migration created them, written out: a migration must do the same
// thing on every database it ever runs on, so it never reads STATION_KINDS from
// shared/stations.ts, which may grow. A new kind is a new migration that adds the value.
const STATION_KINDS = [
  'winding',
  'soldering',
  'hipot',
  'load_test',
  'inspection',
  'packing',
  'other',
] as const

export async function up({ context: { queryInterface } }: { context: MigrationContext }) {
  await queryInterface.createTable('stations', {
    id: { type: DataTypes.UUID, primaryKey: true },
    code: { type: DataTypes.STRING(16), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(80), allowNull: false },
    kind: { type: DataTypes.ENUM(...STATION_KINDS), allowNull: false },
    is_active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
}

export async function down({ context: { queryInterface } }: { context: MigrationContext }) {
  await queryInterface.dropTable('stations')
  await queryInterface.sequelize.query('DROP TYPE IF EXISTS "enum_stations_kind"')
}
