import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { TableModel, tableOptions } from './columns'

/** One append-only row of the audit log; the database refuses UPDATE and DELETE on it. */
export class AuditEvent extends TableModel<AuditEvent> {
  declare id: CreationOptional<string>
  declare at: CreationOptional<Date>
  declare actorId: string | null
  declare actorEmail: string | null
  declare action: string
  declare entity: string
  declare entityId: string | null
  declare before: unknown
  declare after: unknown
  declare ip: string | null
  declare requestId: string | null
}

export function initAuditEvent(sequelize: Sequelize): void {
  AuditEvent.init(
    {
      id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
      at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      actorId: { type: DataTypes.UUID, allowNull: true },
      actorEmail: { type: DataTypes.STRING(254), allowNull: true },
      action: { type: DataTypes.STRING(64), allowNull: false },
      entity: { type: DataTypes.STRING(64), allowNull: false },
      entityId: { type: DataTypes.STRING(64), allowNull: true },
      before: { type: DataTypes.JSONB, allowNull: true },
      after: { type: DataTypes.JSONB, allowNull: true },
      ip: { type: DataTypes.STRING(64), allowNull: true },
      requestId: { type: DataTypes.STRING(64), allowNull: true },
    },
    tableOptions(sequelize, 'audit_events', { timestamps: false }),
  )
}
