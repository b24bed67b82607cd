import { DataTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'

export class Winding extends RecordModel<Winding> {
  declare revisionId: string
  declare position: number
  declare name: string
  declare nominalTurns: number
  declare alNanoHenry: number
  declare alTolerancePercent: number
  declare coreAreaMm2: number | null
}

export function initWinding(sequelize: Sequelize): void {
  initRecord(Winding, sequelize, 'windings', {
    revisionId: { type: DataTypes.UUID, allowNull: false },
    position: { type: DataTypes.INTEGER, allowNull: false },
    name: { type: DataTypes.STRING(40), allowNull: false },
    nominalTurns: { type: DataTypes.INTEGER, allowNull: false },
    alNanoHenry: { type: DataTypes.DOUBLE, allowNull: false },
    alTolerancePercent: { type: DataTypes.DOUBLE, allowNull: false },
    coreAreaMm2: { type: DataTypes.DOUBLE, allowNull: true, field: 'core_area_mm2' },
  })
}
