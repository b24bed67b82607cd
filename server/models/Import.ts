import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { IMPORT_STATUSES } from '../../shared/imports'
import type { ImportMapping, ImportStatus } from '../../shared/imports'

export class Import extends RecordModel<Import> {
  declare stationId: string
  declare uploadId: string
  declare sha256: string
  declare filename: string
  declare columns: string[]
  declare rowCount: number
  declare status: CreationOptional<ImportStatus>
  declare progress: CreationOptional<number>
  declare mapping: CreationOptional<ImportMapping | null>
  declare defectCodeId: CreationOptional<string | null>
  declare readyCount: CreationOptional<number>
  declare errorCount: CreationOptional<number>
  declare recordedCount: CreationOptional<number>
  declare skippedCount: CreationOptional<number>
  declare failedCount: CreationOptional<number>
  declare error: CreationOptional<string | null>
  declare createdBy: string
  declare checkedAt: CreationOptional<Date | null>
  declare startedAt: CreationOptional<Date | null>
  declare finishedAt: CreationOptional<Date | null>
}

export function initImport(sequelize: Sequelize): void {
  initRecord(Import, sequelize, 'imports', {
    stationId: { type: DataTypes.UUID, allowNull: false },
    uploadId: { type: DataTypes.UUID, allowNull: false },
    sha256: { type: DataTypes.CHAR(64), allowNull: false, field: 'sha256' },
    filename: { type: DataTypes.STRING(200), allowNull: false },
    columns: { type: DataTypes.JSONB, allowNull: false },
    rowCount: { type: DataTypes.INTEGER, allowNull: false },
    status: {
      type: DataTypes.ENUM(...IMPORT_STATUSES),
      allowNull: false,
      defaultValue: 'uploaded',
    },
    progress: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    mapping: { type: DataTypes.JSONB, allowNull: true, defaultValue: null },
    defectCodeId: { type: DataTypes.UUID, allowNull: true, defaultValue: null },
    readyCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    errorCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    recordedCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    skippedCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    failedCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    error: { type: DataTypes.TEXT, allowNull: true, defaultValue: null },
    createdBy: { type: DataTypes.UUID, allowNull: false },
    checkedAt: { type: DataTypes.DATE, allowNull: true, defaultValue: null },
    startedAt: { type: DataTypes.DATE, allowNull: true, defaultValue: null },
    finishedAt: { type: DataTypes.DATE, allowNull: true, defaultValue: null },
  })
}
