import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { TableModel, tableOptions, uuidKey } from './columns'

export class StepRun extends TableModel<StepRun> {
  declare id: CreationOptional<string>
  declare unitId: string
  declare stepId: string
  declare stationId: string
  declare operatorId: string
  declare countersignedBy: string | null
  declare attempt: number
  declare isRework: boolean
  declare result: 'pass' | 'fail'
  declare note: string
  declare clientEventId: string
  declare startedAt: Date
  declare finishedAt: Date
}

export function initStepRun(sequelize: Sequelize): void {
  StepRun.init(
    {
      id: uuidKey(),
      unitId: { type: DataTypes.UUID, allowNull: false },
      stepId: { type: DataTypes.UUID, allowNull: false },
      stationId: { type: DataTypes.UUID, allowNull: false },
      operatorId: { type: DataTypes.UUID, allowNull: false },
      countersignedBy: { type: DataTypes.UUID, allowNull: true },
      attempt: { type: DataTypes.INTEGER, allowNull: false },
      isRework: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      result: { type: DataTypes.ENUM('pass', 'fail'), allowNull: false },
      note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      clientEventId: { type: DataTypes.UUID, allowNull: false, unique: true },
      startedAt: { type: DataTypes.DATE, allowNull: false },
      finishedAt: { type: DataTypes.DATE, allowNull: false },
    },
    tableOptions(sequelize, 'step_runs', { timestamps: false }),
  )
}
