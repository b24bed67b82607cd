import { DataTypes } from 'sequelize'
import type { NonAttribute, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { TRACE_LEVELS } from '../../shared/recipeDefinitions'
import type { TraceLevel } from '../../shared/recipeDefinitions'
import type { Part } from './Part'

export class BomLine extends RecordModel<BomLine> {
  declare revisionId: string
  declare partId: string
  declare quantity: number
  declare refDesignators: string
  declare fittedAtStepId: string | null
  declare traceLevel: TraceLevel
  declare position: number
  // associations
  declare part?: NonAttribute<Part>
}

export function initBomLine(sequelize: Sequelize): void {
  initRecord(BomLine, sequelize, 'bom_lines', {
    revisionId: { type: DataTypes.UUID, allowNull: false },
    partId: { type: DataTypes.UUID, allowNull: false },
    quantity: { type: DataTypes.DOUBLE, allowNull: false },
    refDesignators: { type: DataTypes.STRING(400), allowNull: false, defaultValue: '' },
    fittedAtStepId: { type: DataTypes.UUID, allowNull: true },
    traceLevel: { type: DataTypes.ENUM(...TRACE_LEVELS), allowNull: false, defaultValue: 'lot' },
    position: { type: DataTypes.INTEGER, allowNull: false },
  })
}
