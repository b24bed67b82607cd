import { DataTypes, Model } from 'sequelize'
import type {
  CreationOptional,
  InferAttributes,
  InferCreationAttributes,
  Sequelize,
} from 'sequelize'
import type { StationKind } from '../../shared/stations'

export class DefectCode extends Model<
  InferAttributes<DefectCode>,
  InferCreationAttributes<DefectCode>
> {
  declare id: CreationOptional<string>
  declare code: string
  declare description: string
  declare stationKinds: StationKind[]
  declare isActive: CreationOptional<boolean>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export function initDefectCode(sequelize: Sequelize): void {
  DefectCode.init(
    {
      id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
      code: { type: DataTypes.STRING(16), allowNull: false, unique: true },
      description: { type: DataTypes.STRING(200), allowNull: false },
      // Stored as the stations' enum array; read and written as plain strings.
      stationKinds: { type: DataTypes.ARRAY(DataTypes.STRING), allowNull: false },
      isActive: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'defect_codes', underscored: true },
  )
}
