import { DataTypes } from 'sequelize'
import type { CreationOptional, NonAttribute, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import type { Revision } from './Revision'

export class Product extends RecordModel<Product> {
  declare code: string
  declare name: string
  declare description: CreationOptional<string>
  // associations
  declare revisions?: NonAttribute<Revision[]>
}

export function initProduct(sequelize: Sequelize): void {
  initRecord(Product, sequelize, 'products', {
    code: { type: DataTypes.STRING(6), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(80), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
  })
}
