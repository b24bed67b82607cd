import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  Sequelize,
} from 'sequelize'
import { SERVICE_CASE_RESOLUTIONS, SERVICE_CASE_STATUSES } from '../../shared/service'
import type { ServiceCaseResolution, ServiceCaseStatus } from '../../shared/service'

export class ServiceCase extends Model<
  InferAttributes<ServiceCase>,
  InferCreationAttributes<ServiceCase>
> {
  declare id: CreationOptional<string>
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
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export function initServiceCase(sequelize: Sequelize): void {
  ServiceCase.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
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
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'service_cases', underscored: true },
  )
}
