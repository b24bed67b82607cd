import { DataTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import type { UnitOfMeasure } from '../../shared/recipeDefinitions'

export class Part extends RecordModel<Part> {
  declare partNumber: string
  declare description: string
  declare unitOfMeasure: UnitOfMeasure
  declare hasExpiry: boolean
}

export function initPart(sequelize: Sequelize): void {
  initRecord(Part, sequelize, 'parts', {
    partNumber: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    description: { type: DataTypes.STRING(200), allowNull: false },
    unitOfMeasure: { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'pcs' },
    hasExpiry: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
  })
}
