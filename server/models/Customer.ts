import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  Sequelize,
} from 'sequelize'

export class Customer extends Model<InferAttributes<Customer>, InferCreationAttributes<Customer>> {
  declare id: CreationOptional<string>
  declare name: string
  declare contactEmail: CreationOptional<string>
  declare address: CreationOptional<string>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export function initCustomer(sequelize: Sequelize): void {
  Customer.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      contactEmail: { type: DataTypes.STRING(320), allowNull: false, defaultValue: '' },
      address: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'customers', underscored: true },
  )
}
