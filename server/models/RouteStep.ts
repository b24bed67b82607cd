import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  NonAttribute,
  Sequelize,
} from 'sequelize'
import { STATION_KINDS } from '../../shared/stations'
import type { StationKind } from '../../shared/stations'
import type { Check } from './Check'

export class RouteStep extends Model<
  InferAttributes<RouteStep>,
  InferCreationAttributes<RouteStep>
> {
  declare id: CreationOptional<string>
  declare revisionId: string
  declare position: number
  declare name: string
  declare stationKind: StationKind
  declare instructions: string
  declare safetyNote: string
  declare requiresSignoff: boolean
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  // associations
  declare checks?: NonAttribute<Check[]>
}

export function initRouteStep(sequelize: Sequelize): void {
  RouteStep.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
      revisionId: { type: DataTypes.UUID, allowNull: false },
      position: { type: DataTypes.INTEGER, allowNull: false },
      name: { type: DataTypes.STRING(80), allowNull: false },
      // The column reuses the stations' enum type, so a step names exactly a station kind.
      stationKind: { type: DataTypes.ENUM(...STATION_KINDS), allowNull: false },
      instructions: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      safetyNote: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      requiresSignoff: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'route_steps', underscored: true },
  )
}
