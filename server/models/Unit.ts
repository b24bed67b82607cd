import { DataTypes } from 'sequelize'
import type { CreationOptional, NonAttribute, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { UNIT_STATES } from '../../shared/lots'
import type { UnitState } from '../../shared/lots'
import type { Lot } from './Lot'
import type { RouteStep } from './RouteStep'

export class Unit extends RecordModel<Unit> {
  declare serial: string
  declare lotId: string
  declare state: CreationOptional<UnitState>
  declare currentStepId: string | null
  declare reworkCount: CreationOptional<number>
  declare reworkUntilPosition: number | null
  declare holdReason: CreationOptional<string>
  declare holdKind: 'nonconformance' | 'lot' | 'containment' | null
  declare heldFromState: UnitState | null
  declare finishedAt: Date | null
  // associations
  declare lot?: NonAttribute<Lot>
  declare currentStep?: NonAttribute<RouteStep | null>
}

export function initUnit(sequelize: Sequelize): void {
  initRecord(Unit, sequelize, 'units', {
    serial: { type: DataTypes.STRING(24), allowNull: false, unique: true },
    lotId: { type: DataTypes.UUID, allowNull: false },
    state: { type: DataTypes.ENUM(...UNIT_STATES), allowNull: false, defaultValue: 'queued' },
    currentStepId: { type: DataTypes.UUID, allowNull: true },
    reworkCount: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    reworkUntilPosition: { type: DataTypes.INTEGER, allowNull: true },
    holdReason: { type: DataTypes.STRING(500), allowNull: false, defaultValue: '' },
    holdKind: { type: DataTypes.STRING(20), allowNull: true },
    heldFromState: { type: DataTypes.ENUM(...UNIT_STATES), allowNull: true },
    finishedAt: { type: DataTypes.DATE, allowNull: true },
  })
}
