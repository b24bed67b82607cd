import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { DOCUMENT_STATUSES } from '../../shared/lots'
import type { DocumentKind, DocumentStatus } from '../../shared/lots'

export class Document extends RecordModel<Document> {
  declare kind: DocumentKind
  declare lotId: string | null
  declare unitId: string | null
  declare shipmentId: CreationOptional<string | null>
  declare layout: string | null
  declare status: CreationOptional<DocumentStatus>
  declare progress: CreationOptional<number>
  declare filename: string
  declare storageKey: string | null
  declare sha256: string | null
  declare size: number | null
  declare error: string | null
  declare createdBy: string | null
  declare finishedAt: Date | null
}

export function initDocument(sequelize: Sequelize): void {
  initRecord(Document, sequelize, 'documents', {
    kind: { type: DataTypes.STRING(20), allowNull: false },
    lotId: { type: DataTypes.UUID, allowNull: true },
    unitId: { type: DataTypes.UUID, allowNull: true },
    shipmentId: { type: DataTypes.UUID, allowNull: true },
    layout: { type: DataTypes.STRING(20), allowNull: true },
    status: {
      type: DataTypes.ENUM(...DOCUMENT_STATUSES),
      allowNull: false,
      defaultValue: 'queued',
    },
    progress: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    filename: { type: DataTypes.STRING(200), allowNull: false },
    storageKey: { type: DataTypes.STRING(200), allowNull: true },
    sha256: { type: DataTypes.CHAR(64), allowNull: true, field: 'sha256' },
    size: { type: DataTypes.INTEGER, allowNull: true },
    error: { type: DataTypes.TEXT, allowNull: true },
    createdBy: { type: DataTypes.UUID, allowNull: true },
    finishedAt: { type: DataTypes.DATE, allowNull: true },
  })
}
