import { DataTypes } from 'sequelize'
import type { CreationOptional, NonAttribute, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { LOT_STATUSES } from '../../shared/lots'
import type { LotStatus } from '../../shared/lots'
import type { Revision } from './Revision'

export class Lot extends RecordModel<Lot> {
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
  // associations
  declare revision?: NonAttribute<Revision>
}

export function initLot(sequelize: Sequelize): void {
  initRecord(Lot, sequelize, 'lots', {
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
  })
}
