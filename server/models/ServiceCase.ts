import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { SERVICE_CASE_RESOLUTIONS, SERVICE_CASE_STATUSES } from '../../shared/service'
import type { ServiceCaseResolution, ServiceCaseStatus } from '../../shared/service'

export class ServiceCase extends RecordModel<ServiceCase> {
  declare number: string
  declare unitId: string
  declare customerId: string | null
  declare complaint: string
  declare receivedOn: string
  declare findings: CreationOptional<string>
  declare defectCodeId: string | null
  declare resolution: ServiceCaseResolution | null
  declare replacementUnitId: string | null
  declare reworkToStepId: CreationOptional<string | null>
  declare status: CreationOptional<ServiceCaseStatus>
  declare openedBy: string | null
  declare closedBy: string | null
  declare closedAt: Date | null
}

export function initServiceCase(sequelize: Sequelize): void {
  initRecord(ServiceCase, sequelize, 'service_cases', {
    number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
    unitId: { type: DataTypes.UUID, allowNull: false },
    customerId: { type: DataTypes.UUID, allowNull: true },
    complaint: { type: DataTypes.TEXT, allowNull: false },
    receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
    findings: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    defectCodeId: { type: DataTypes.UUID, allowNull: true },
    resolution: { type: DataTypes.ENUM(...SERVICE_CASE_RESOLUTIONS), allowNull: true },
    replacementUnitId: { type: DataTypes.UUID, allowNull: true },
    reworkToStepId: { type: DataTypes.UUID, allowNull: true },
    status: {
      type: DataTypes.ENUM(...SERVICE_CASE_STATUSES),
      allowNull: false,
      defaultValue: 'open',
    },
    openedBy: { type: DataTypes.UUID, allowNull: true },
    closedBy: { type: DataTypes.UUID, allowNull: true },
    closedAt: { type: DataTypes.DATE, allowNull: true },
  })
}
