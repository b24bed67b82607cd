import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { TableModel, tableOptions, uuidKey } from './columns'

export class Consumption extends TableModel<Consumption> {
  declare id: CreationOptional<string>
  declare unitId: string
  declare componentLotId: string
  /** The component lot's part, kept here so that a part serial is unique across its lots. */
  declare partId: string
  declare bomLineId: string
  declare stepRunId: string
  declare quantity: number
  declare itemSerial: string | null
  declare createdAt: CreationOptional<Date>
}

export function initConsumption(sequelize: Sequelize): void {
  Consumption.init(
    {
      id: uuidKey(),
      unitId: { type: DataTypes.UUID, allowNull: false },
      componentLotId: { type: DataTypes.UUID, allowNull: false },
      partId: { type: DataTypes.UUID, allowNull: false },
      bomLineId: { type: DataTypes.UUID, allowNull: false },
      stepRunId: { type: DataTypes.UUID, allowNull: false },
      quantity: { type: DataTypes.DOUBLE, allowNull: false },
      itemSerial: { type: DataTypes.STRING(80), allowNull: true },
      createdAt: DataTypes.DATE,
    },
    tableOptions(sequelize, 'consumptions', { updatedAt: false }),
  )
}
