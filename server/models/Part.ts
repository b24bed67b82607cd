import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  Sequelize,
} from 'sequelize'
import type { UnitOfMeasure } from '../../shared/recipes/definitions'

export class Part extends Model<InferAttributes<Part>, InferCreationAttributes<Part>> {
  declare id: CreationOptional<string>
  declare partNumber: string
  declare description: string
  declare unitOfMeasure: UnitOfMeasure
  declare hasExpiry: boolean
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export function initPart(sequelize: Sequelize): void {
  Part.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
      partNumber: { type: DataTypes.STRING(40), allowNull: false, unique: true },
      description: { type: DataTypes.STRING(200), allowNull: false },
      unitOfMeasure: { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'pcs' },
      hasExpiry: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'parts', underscored: true },
  )
}
