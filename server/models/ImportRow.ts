import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { TableModel, tableOptions } from './columns'
import { IMPORT_ROW_OUTCOMES } from '../../shared/imports'
import type { ImportRowOutcome } from '../../shared/imports'
import type { ImportRowCheckDto } from '../../shared/schemas/imports'

export class ImportRow extends TableModel<ImportRow> {
  declare importId: string
  declare rowNumber: number
  declare clientEventId: string
  declare serial: string
  declare unitId: string | null
  declare stepId: string | null
  declare stepName: string | null
  declare benchTime: string | null
  declare benchOperator: string | null
  declare values: Record<string, number | boolean | string | null>
  declare checks: ImportRowCheckDto[]
  declare result: 'pass' | 'fail' | null
  declare errors: string[]
  declare outcome: CreationOptional<ImportRowOutcome | null>
  declare outcomeMessage: CreationOptional<string | null>
  declare stepRunId: CreationOptional<string | null>
}

export function initImportRow(sequelize: Sequelize): void {
  ImportRow.init(
    {
      importId: { type: DataTypes.UUID, primaryKey: true },
      rowNumber: { type: DataTypes.INTEGER, primaryKey: true },
      clientEventId: { type: DataTypes.UUID, allowNull: false },
      serial: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
      unitId: { type: DataTypes.UUID, allowNull: true },
      stepId: { type: DataTypes.UUID, allowNull: true },
      stepName: { type: DataTypes.STRING(200), allowNull: true },
      benchTime: { type: DataTypes.STRING(100), allowNull: true },
      benchOperator: { type: DataTypes.STRING(100), allowNull: true },
      values: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      checks: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
      result: { type: DataTypes.STRING(4), allowNull: true },
      errors: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
      outcome: {
        type: DataTypes.ENUM(...IMPORT_ROW_OUTCOMES),
        allowNull: true,
        defaultValue: null,
      },
      outcomeMessage: { type: DataTypes.TEXT, allowNull: true, defaultValue: null },
      stepRunId: { type: DataTypes.UUID, allowNull: true, defaultValue: null },
    },
    tableOptions(sequelize, 'import_rows', { timestamps: false }),
  )
}
