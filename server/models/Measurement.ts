import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { TableModel, tableOptions } from './columns'

export class Measurement extends TableModel<Measurement> {
  declare id: CreationOptional<string>
  declare stepRunId: string
  declare checkId: string
  declare valueNumber: number | null
  declare valueText: string | null
  declare valueBoolean: boolean | null
  declare isDerived: boolean
  declare isPass: boolean
}

export function initMeasurement(sequelize: Sequelize): void {
  Measurement.init(
    {
      id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
      stepRunId: { type: DataTypes.UUID, allowNull: false },
      checkId: { type: DataTypes.UUID, allowNull: false },
      valueNumber: { type: DataTypes.DOUBLE, allowNull: true },
      valueText: { type: DataTypes.TEXT, allowNull: true },
      valueBoolean: { type: DataTypes.BOOLEAN, allowNull: true },
      isDerived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      isPass: { type: DataTypes.BOOLEAN, allowNull: false },
    },
    tableOptions(sequelize, 'measurements', { timestamps: false }),
  )
}
