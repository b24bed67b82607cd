import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  NonAttribute,
  Sequelize,
} from 'sequelize'
import type { Customer } from './Customer'

export class Shipment extends Model<InferAttributes<Shipment>, InferCreationAttributes<Shipment>> {
  declare id: CreationOptional<string>
  declare number: string
  declare customerId: string
  declare orderRef: CreationOptional<string>
  declare carrier: CreationOptional<string>
  declare tracking: CreationOptional<string>
  declare shippedOn: string
  declare createdBy: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  // associations
  declare customer?: NonAttribute<Customer>
}

export function initShipment(sequelize: Sequelize): void {
  Shipment.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
      number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
      customerId: { type: DataTypes.UUID, allowNull: false },
      orderRef: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
      carrier: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
      tracking: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
      shippedOn: { type: DataTypes.DATEONLY, allowNull: false },
      createdBy: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'shipments', underscored: true },
  )
}

/**
 * One unit in one shipment. A repaired return ships again, so a unit may be in several
 * shipments; the latest is where it is now.
 */
export class ShipmentUnit extends Model<
  InferAttributes<ShipmentUnit>,
  InferCreationAttributes<ShipmentUnit>
> {
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
    { sequelize, tableName: 'shipment_units', underscored: true, updatedAt: false },
  )
}
