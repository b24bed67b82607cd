import { DataTypes } from 'sequelize'
import type { NonAttribute, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { STATION_KINDS } from '../../shared/stations'
import type { StationKind } from '../../shared/stations'
import type { Check } from './Check'

export class RouteStep extends RecordModel<RouteStep> {
  declare revisionId: string
  declare position: number
  declare name: string
  declare stationKind: StationKind
  declare instructions: string
  declare safetyNote: string
  declare requiresSignoff: boolean
  // associations
  declare checks?: NonAttribute<Check[]>
}

export function initRouteStep(sequelize: Sequelize): void {
  initRecord(RouteStep, sequelize, 'route_steps', {
    revisionId: { type: DataTypes.UUID, allowNull: false },
    position: { type: DataTypes.INTEGER, allowNull: false },
    name: { type: DataTypes.STRING(80), allowNull: false },
    // The column reuses the stations' enum type, so a step names exactly a station kind.
    stationKind: { type: DataTypes.ENUM(...STATION_KINDS), allowNull: false },
    instructions: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    safetyNote: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    requiresSignoff: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
  })
}
