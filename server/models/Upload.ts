import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { TableModel, tableOptions, uuidKey } from './columns'

export class Upload extends TableModel<Upload> {
  declare id: CreationOptional<string>
  declare storageKey: string
  declare sha256: string
  declare filename: string
  declare contentType: string
  declare size: number
  declare uploadedBy: string | null
  declare createdAt: CreationOptional<Date>
}

export function initUpload(sequelize: Sequelize): void {
  Upload.init(
    {
      id: uuidKey(),
      storageKey: { type: DataTypes.STRING(200), allowNull: false },
      sha256: { type: DataTypes.CHAR(64), allowNull: false, field: 'sha256' },
      filename: { type: DataTypes.STRING(200), allowNull: false },
      contentType: { type: DataTypes.STRING(100), allowNull: false },
      size: { type: DataTypes.INTEGER, allowNull: false },
      uploadedBy: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
    },
    tableOptions(sequelize, 'uploads', { updatedAt: false }),
  )
}
