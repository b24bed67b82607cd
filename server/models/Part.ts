import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import type { UnitOfMeasure } from '../../shared/recipeDefinitions'

export class Part extends RecordModel<Part> {
  declare partNumber: string
  declare description: string
  declare unitOfMeasure: UnitOfMeasure
  declare hasExpiry: boolean
  declare needsInspection: CreationOptional<boolean>
  declare shelfLifeDays: number | null
}

export function initPart(sequelize: Sequelize): void {
  initRecord(Part, sequelize, 'parts', {
    partNumber: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    description: { type: DataTypes.STRING(200), allowNull: false },
    unitOfMeasure: { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'pcs' },
    hasExpiry: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    needsInspection: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    shelfLifeDays: { type: DataTypes.INTEGER, allowNull: true },
  })
}
