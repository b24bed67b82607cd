import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  NonAttribute,
  Sequelize,
} from 'sequelize'
import { COMPONENT_LOT_STATUSES } from '../../shared/recipes/definitions'
import type { ComponentLotStatus } from '../../shared/recipes/definitions'
import type { Part } from './Part'
import type { Upload } from './Upload'

export class ComponentLot extends Model<
  InferAttributes<ComponentLot>,
  InferCreationAttributes<ComponentLot>
> {
  declare id: CreationOptional<string>
  declare internalCode: string
  declare partId: string
  declare supplierName: string
  declare supplierLotCode: string
  declare quantityReceived: number
  declare quantityRemaining: number
  declare receivedOn: string
  declare expiresOn: string | null
  declare status: CreationOptional<ComponentLotStatus>
  declare notes: CreationOptional<string>
  declare certificateUploadId: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  // associations
  declare part?: NonAttribute<Part>
  declare certificate?: NonAttribute<Upload | null>
}

export function initComponentLot(sequelize: Sequelize): void {
  ComponentLot.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
      internalCode: { type: DataTypes.STRING(20), allowNull: false, unique: true },
      partId: { type: DataTypes.UUID, allowNull: false },
      supplierName: { type: DataTypes.STRING(120), allowNull: false },
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
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'component_lots', underscored: true },
  )
}
