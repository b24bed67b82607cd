import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  Sequelize,
} from 'sequelize'
import { ALERT_RULES, ALERT_STATUSES } from '../../shared/quality/alerts'
import type { AlertDetails, AlertRule, AlertStatus } from '../../shared/quality/alerts'

/** A quality alert on a lot's step; unique per lot, step, rule and check. */
export class Alert extends Model<InferAttributes<Alert>, InferCreationAttributes<Alert>> {
  declare id: CreationOptional<string>
  declare lotId: string
  declare stepId: string
  declare rule: AlertRule
  declare checkId: string | null
  declare details: AlertDetails
  declare status: CreationOptional<AlertStatus>
  declare acknowledgedBy: string | null
  declare acknowledgedAt: Date | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export function initAlert(sequelize: Sequelize): void {
  Alert.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
      lotId: { type: DataTypes.UUID, allowNull: false },
      stepId: { type: DataTypes.UUID, allowNull: false },
      rule: {
        type: DataTypes.STRING(32),
        allowNull: false,
        validate: { isIn: { args: [ALERT_RULES], msg: 'unknown alert rule' } },
      },
      checkId: { type: DataTypes.UUID, allowNull: true },
      details: { type: DataTypes.JSONB, allowNull: false },
      status: { type: DataTypes.ENUM(...ALERT_STATUSES), allowNull: false, defaultValue: 'open' },
      acknowledgedBy: { type: DataTypes.UUID, allowNull: true },
      acknowledgedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'alerts', underscored: true },
  )
}
