import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { EMAIL_DIRECTIONS, EMAIL_STATUSES } from '../../shared/schemas/outbox'
import type {
  EmailAttachmentRecord,
  EmailDirection,
  EmailStatus,
} from '../../shared/schemas/outbox'

export class Email extends RecordModel<Email> {
  declare direction: CreationOptional<EmailDirection>
  declare status: CreationOptional<EmailStatus>
  declare toAddresses: string[]
  declare fromAddress: string
  declare subject: string
  declare textBody: string
  declare htmlBody: string | null
  declare attachments: CreationOptional<EmailAttachmentRecord[]>
  declare messageId: string | null
  declare error: string | null
  declare attempts: CreationOptional<number>
  declare relatedEntity: string | null
  declare relatedId: string | null
  declare createdBy: string | null
  declare sentAt: Date | null
  /** When the local mail fake filed its copy of this sent message (matched by Message-ID). */
  declare receiptAt: CreationOptional<Date | null>
}

export function initEmail(sequelize: Sequelize): void {
  initRecord(Email, sequelize, 'emails', {
    direction: {
      type: DataTypes.STRING(8),
      allowNull: false,
      defaultValue: 'out',
      validate: { isIn: { args: [EMAIL_DIRECTIONS], msg: 'direction must be out' } },
    },
    status: {
      type: DataTypes.ENUM(...EMAIL_STATUSES),
      allowNull: false,
      defaultValue: 'queued',
    },
    toAddresses: {
      type: DataTypes.ARRAY(DataTypes.TEXT),
      allowNull: false,
      validate: {
        hasOne(value: unknown) {
          if (!Array.isArray(value) || value.length === 0)
            throw new Error('an e-mail needs at least one recipient')
        },
      },
    },
    fromAddress: { type: DataTypes.STRING(320), allowNull: false },
    subject: { type: DataTypes.STRING(998), allowNull: false },
    textBody: { type: DataTypes.TEXT, allowNull: false },
    htmlBody: { type: DataTypes.TEXT, allowNull: true },
    attachments: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    messageId: { type: DataTypes.STRING(998), allowNull: true },
    error: { type: DataTypes.TEXT, allowNull: true },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    relatedEntity: { type: DataTypes.STRING(64), allowNull: true },
    relatedId: { type: DataTypes.UUID, allowNull: true },
    createdBy: { type: DataTypes.UUID, allowNull: true },
    sentAt: { type: DataTypes.DATE, allowNull: true },
    receiptAt: { type: DataTypes.DATE, allowNull: true },
  })
}
