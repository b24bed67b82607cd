import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  Sequelize,
} from 'sequelize'
import { STATION_KINDS } from '../../shared/stations'
import type { StationKind } from '../../shared/stations'

export class Station extends Model<InferAttributes<Station>, InferCreationAttributes<Station>> {
  declare id: CreationOptional<string>
  declare code: string
  declare name: string
  declare kind: StationKind
  declare isActive: CreationOptional<boolean>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export function initStation(sequelize: Sequelize): void {
  Station.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
      code: { type: DataTypes.STRING(16), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(80), allowNull: false },
      kind: { type: DataTypes.ENUM(...STATION_KINDS), allowNull: false },
      isActive: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'stations', underscored: true },
  )
}
