import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  Sequelize,
} from 'sequelize'

export class Winding extends Model<InferAttributes<Winding>, InferCreationAttributes<Winding>> {
  declare id: CreationOptional<string>
  declare revisionId: string
  declare position: number
  declare name: string
  declare nominalTurns: number
  declare alNanoHenry: number
  declare alTolerancePercent: number
  declare coreAreaMm2: number | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export function initWinding(sequelize: Sequelize): void {
  Winding.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
      revisionId: { type: DataTypes.UUID, allowNull: false },
      position: { type: DataTypes.INTEGER, allowNull: false },
      name: { type: DataTypes.STRING(40), allowNull: false },
      nominalTurns: { type: DataTypes.INTEGER, allowNull: false },
      alNanoHenry: { type: DataTypes.DOUBLE, allowNull: false },
      alTolerancePercent: { type: DataTypes.DOUBLE, allowNull: false },
      coreAreaMm2: { type: DataTypes.DOUBLE, allowNull: true, field: 'core_area_mm2' },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'windings', underscored: true },
  )
}
