import { DataTypes } from 'sequelize'
import type { CreationOptional, NonAttribute, Sequelize } from 'sequelize'
import { initRecord, RecordModel, TableModel, tableOptions } from './columns'
import type { Customer } from './Customer'

export class Shipment extends RecordModel<Shipment> {
  declare number: string
  declare customerId: string
  declare orderRef: CreationOptional<string>
  declare carrier: CreationOptional<string>
  declare tracking: CreationOptional<string>
  declare shippedOn: string
  declare createdBy: string | null
  // associations
  declare customer?: NonAttribute<Customer>
}

export function initShipment(sequelize: Sequelize): void {
  initRecord(Shipment, sequelize, 'shipments', {
    number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
    customerId: { type: DataTypes.UUID, allowNull: false },
    orderRef: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
    carrier: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
    tracking: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
    shippedOn: { type: DataTypes.DATEONLY, allowNull: false },
    createdBy: { type: DataTypes.UUID, allowNull: true },
  })
}

/**
 * One unit in one shipment. A repaired return ships again, so a unit may be in several
 * shipments; the latest is where it is now.
 */
export class ShipmentUnit extends TableModel<ShipmentUnit> {
  declare unitId: string
  declare shipmentId: string
  declare createdAt: CreationOptional<Date>
}

export function initShipmentUnit(sequelize: Sequelize): void {
  ShipmentUnit.init(
    {
      unitId: { type: DataTypes.UUID, primaryKey: true },
      shipmentId: { type: DataTypes.UUID, primaryKey: true },
      createdAt: DataTypes.DATE,
    },
    tableOptions(sequelize, 'shipment_units', { updatedAt: false }),
  )
}
