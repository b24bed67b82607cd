import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  NonAttribute,
  Sequelize,
} from 'sequelize'
import { LOT_STATUSES } from '../../shared/lots'
import type { LotStatus } from '../../shared/lots'
import type { Revision } from './Revision'

export class Lot extends Model<InferAttributes<Lot>, InferCreationAttributes<Lot>> {
  declare id: CreationOptional<string>
  declare number: string
  declare revisionId: string
  declare quantity: number
  declare orderRef: string
  declare customerName: string
  declare customerId: CreationOptional<string | null>
  declare dueDate: string | null
  declare status: CreationOptional<LotStatus>
  declare isOnHold: CreationOptional<boolean>
  declare holdReason: CreationOptional<string>
  declare releasedAt: Date | null
  declare closedAt: Date | null
  declare createdBy: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  // associations
  declare revision?: NonAttribute<Revision>
}

export function initLot(sequelize: Sequelize): void {
  Lot.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
      number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
      revisionId: { type: DataTypes.UUID, allowNull: false },
      quantity: { type: DataTypes.INTEGER, allowNull: false },
      orderRef: { type: DataTypes.STRING(80), allowNull: false, defaultValue: '' },
      customerId: { type: DataTypes.UUID, allowNull: true },
      customerName: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
      dueDate: { type: DataTypes.DATEONLY, allowNull: true },
      status: { type: DataTypes.ENUM(...LOT_STATUSES), allowNull: false, defaultValue: 'planned' },
      isOnHold: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      holdReason: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
      releasedAt: { type: DataTypes.DATE, allowNull: true },
      closedAt: { type: DataTypes.DATE, allowNull: true },
      createdBy: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'lots', underscored: true },
  )
}
