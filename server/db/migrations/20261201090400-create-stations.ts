import { DataTypes } from 'sequelize'
import { STATION_KINDS } from '../../../shared/stations'
import type { MigrationContext } from '../migrator'

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
