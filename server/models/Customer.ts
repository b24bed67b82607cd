import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'

export class Customer extends RecordModel<Customer> {
  declare name: string
  declare contactEmail: CreationOptional<string>
  declare address: CreationOptional<string>
}

export function initCustomer(sequelize: Sequelize): void {
  initRecord(Customer, sequelize, 'customers', {
    name: { type: DataTypes.STRING(120), allowNull: false },
    contactEmail: { type: DataTypes.STRING(320), allowNull: false, defaultValue: '' },
    address: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
  })
}
