import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { TableModel, tableOptions, uuidKey } from './columns'
import { DISPOSITIONS } from '../../shared/lots'
import type { Disposition } from '../../shared/lots'

export class Nonconformance extends TableModel<Nonconformance> {
  declare id: CreationOptional<string>
  declare unitId: string
  declare stepRunId: string
  declare defectCodeId: string | null
  declare description: string
  declare failedChecks: string[]
  declare disposition: Disposition | null
  declare reworkToStepId: string | null
  declare reason: CreationOptional<string>
  declare openedBy: string | null
  declare decidedBy: string | null
  declare countersignedBy: string | null
  declare openedAt: Date
  declare closedAt: Date | null
}

export function initNonconformance(sequelize: Sequelize): void {
  Nonconformance.init(
    {
      id: uuidKey(),
      unitId: { type: DataTypes.UUID, allowNull: false },
      stepRunId: { type: DataTypes.UUID, allowNull: false },
      defectCodeId: { type: DataTypes.UUID, allowNull: true },
      description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      failedChecks: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
      disposition: { type: DataTypes.ENUM(...DISPOSITIONS), allowNull: true },
      reworkToStepId: { type: DataTypes.UUID, allowNull: true },
      reason: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      openedBy: { type: DataTypes.UUID, allowNull: true },
      decidedBy: { type: DataTypes.UUID, allowNull: true },
      countersignedBy: { type: DataTypes.UUID, allowNull: true },
      openedAt: { type: DataTypes.DATE, allowNull: false },
      closedAt: { type: DataTypes.DATE, allowNull: true },
    },
    tableOptions(sequelize, 'nonconformances', { timestamps: false }),
  )
}
