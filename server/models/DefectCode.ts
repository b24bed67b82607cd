import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import type { StationKind } from '../../shared/stations'

export class DefectCode extends RecordModel<DefectCode> {
  declare code: string
  declare description: string
  declare stationKinds: StationKind[]
  declare isActive: CreationOptional<boolean>
}

export function initDefectCode(sequelize: Sequelize): void {
  initRecord(DefectCode, sequelize, 'defect_codes', {
    code: { type: DataTypes.STRING(16), allowNull: false, unique: true },
    description: { type: DataTypes.STRING(200), allowNull: false },
    // Stored as the stations' enum array; read and written as plain strings.
    stationKinds: { type: DataTypes.ARRAY(DataTypes.STRING), allowNull: false },
    isActive: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
  })
}
