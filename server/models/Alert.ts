import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { ALERT_RULES, ALERT_STATUSES } from '../../shared/quality/alerts'
import type { AlertDetails, AlertRule, AlertStatus } from '../../shared/quality/alerts'

/** A quality alert on a lot's step: one episode of one series, open until a lead acknowledges it. */
export class Alert extends RecordModel<Alert> {
  declare lotId: string
  declare stepId: string
  declare rule: AlertRule
  declare rules: CreationOptional<AlertRule[]>
  declare checkId: string | null
  declare details: AlertDetails
  declare status: CreationOptional<AlertStatus>
  declare acknowledgedBy: string | null
  declare acknowledgedAt: Date | null
  declare episodeStart: number | null
  declare endedAt: Date | null
  declare rearmIndex: number | null
}

export function initAlert(sequelize: Sequelize): void {
  initRecord(Alert, sequelize, 'alerts', {
    lotId: { type: DataTypes.UUID, allowNull: false },
    stepId: { type: DataTypes.UUID, allowNull: false },
    rule: {
      type: DataTypes.STRING(32),
      allowNull: false,
      validate: { isIn: { args: [ALERT_RULES], msg: 'unknown alert rule' } },
    },
    rules: { type: DataTypes.ARRAY(DataTypes.STRING(32)), allowNull: false, defaultValue: [] },
    checkId: { type: DataTypes.UUID, allowNull: true },
    details: { type: DataTypes.JSONB, allowNull: false },
    status: { type: DataTypes.ENUM(...ALERT_STATUSES), allowNull: false, defaultValue: 'open' },
    acknowledgedBy: { type: DataTypes.UUID, allowNull: true },
    acknowledgedAt: { type: DataTypes.DATE, allowNull: true },
    episodeStart: { type: DataTypes.INTEGER, allowNull: true },
    endedAt: { type: DataTypes.DATE, allowNull: true },
    rearmIndex: { type: DataTypes.INTEGER, allowNull: true },
  })
}
