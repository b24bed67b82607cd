import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { TableModel, tableOptions } from './columns'

export class ImportMapping extends TableModel<ImportMapping> {
  declare stationId: string
  declare serialColumn: string
  declare timeColumn: string | null
  declare operatorColumn: string | null
  declare checkColumns: Record<string, string>
  declare updatedBy: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export function initImportMapping(sequelize: Sequelize): void {
  ImportMapping.init(
    {
      stationId: { type: DataTypes.UUID, primaryKey: true },
      serialColumn: { type: DataTypes.STRING(200), allowNull: false },
      timeColumn: { type: DataTypes.STRING(200), allowNull: true },
      operatorColumn: { type: DataTypes.STRING(200), allowNull: true },
      checkColumns: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      updatedBy: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    tableOptions(sequelize, 'import_mappings'),
  )
}
