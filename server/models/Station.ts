import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { STATION_KINDS } from '../../shared/stations'
import type { StationKind } from '../../shared/stations'

export class Station extends RecordModel<Station> {
  declare code: string
  declare name: string
  declare kind: StationKind
  declare isActive: CreationOptional<boolean>
}

export function initStation(sequelize: Sequelize): void {
  initRecord(Station, sequelize, 'stations', {
    code: { type: DataTypes.STRING(16), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(80), allowNull: false },
    kind: { type: DataTypes.ENUM(...STATION_KINDS), allowNull: false },
    isActive: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
  })
}
