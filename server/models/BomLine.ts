import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  NonAttribute,
  Sequelize,
} from 'sequelize'
import { TRACE_LEVELS } from '../../shared/recipes/definitions'
import type { TraceLevel } from '../../shared/recipes/definitions'
import type { Part } from './Part'

export class BomLine extends Model<InferAttributes<BomLine>, InferCreationAttributes<BomLine>> {
  declare id: CreationOptional<string>
  declare revisionId: string
  declare partId: string
  declare quantity: number
  declare refDesignators: string
  declare fittedAtStepId: string | null
  declare traceLevel: TraceLevel
  declare position: number
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  // associations
  declare part?: NonAttribute<Part>
}

export function initBomLine(sequelize: Sequelize): void {
  BomLine.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
      revisionId: { type: DataTypes.UUID, allowNull: false },
      partId: { type: DataTypes.UUID, allowNull: false },
      quantity: { type: DataTypes.DOUBLE, allowNull: false },
      refDesignators: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
      fittedAtStepId: { type: DataTypes.UUID, allowNull: true },
      traceLevel: { type: DataTypes.ENUM(...TRACE_LEVELS), allowNull: false, defaultValue: 'lot' },
      position: { type: DataTypes.INTEGER, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'bom_lines', underscored: true },
  )
}
