import { DataTypes } from 'sequelize'
import type { CreationOptional, NonAttribute, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { COMPONENT_LOT_STATUSES } from '../../shared/recipeDefinitions'
import type { ComponentLotStatus } from '../../shared/recipeDefinitions'
import type { Part } from './Part'
import type { Supplier } from './Supplier'
import type { Upload } from './Upload'

export class ComponentLot extends RecordModel<ComponentLot> {
  declare internalCode: string
  declare partId: string
  declare supplierId: string
  declare supplierLotCode: string
  declare quantityReceived: number
  declare quantityRemaining: number
  declare receivedOn: string
  declare expiresOn: string | null
  declare status: CreationOptional<ComponentLotStatus>
  declare notes: CreationOptional<string>
  declare certificateUploadId: string | null
  declare awaitsInspection: CreationOptional<boolean>
  declare inspectedAt: CreationOptional<Date | null>
  declare inspectedBy: CreationOptional<string | null>
  declare inspectionNote: CreationOptional<string>
  // associations
  declare part?: NonAttribute<Part>
  declare certificate?: NonAttribute<Upload | null>
  declare supplier?: NonAttribute<Supplier>
}

export function initComponentLot(sequelize: Sequelize): void {
  initRecord(ComponentLot, sequelize, 'component_lots', {
    internalCode: { type: DataTypes.STRING(20), allowNull: false, unique: true },
    partId: { type: DataTypes.UUID, allowNull: false },
    supplierId: { type: DataTypes.UUID, allowNull: false },
    supplierLotCode: { type: DataTypes.STRING(80), allowNull: false },
    quantityReceived: { type: DataTypes.DOUBLE, allowNull: false },
    quantityRemaining: { type: DataTypes.DOUBLE, allowNull: false },
    receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
    expiresOn: { type: DataTypes.DATEONLY, allowNull: true },
    status: {
      type: DataTypes.ENUM(...COMPONENT_LOT_STATUSES),
      allowNull: false,
      defaultValue: 'available',
    },
    notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    certificateUploadId: { type: DataTypes.UUID, allowNull: true },
    awaitsInspection: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    inspectedAt: { type: DataTypes.DATE, allowNull: true },
    inspectedBy: { type: DataTypes.UUID, allowNull: true },
    inspectionNote: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
  })
}
