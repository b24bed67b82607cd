import { DataTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { CHECK_KINDS } from '../../shared/recipeDefinitions'
import type { CheckKind, DerivedFormula } from '../../shared/recipeDefinitions'
import type { ChoiceOption } from '../../shared/schemas/recipes'
import type { Unit } from '../../shared/units'

export class Check extends RecordModel<Check> {
  declare revisionId: string
  declare stepId: string
  declare position: number
  declare key: string
  declare label: string
  declare kind: CheckKind
  declare unit: Unit | null
  declare nominal: number | null
  declare lower: number | null
  declare upper: number | null
  declare decimals: number
  declare choices: ChoiceOption[] | null
  declare derived: DerivedFormula | null
  declare derivedInputs: Record<string, string> | null
  declare isKey: boolean
  declare isForCustomers: boolean
}

export function initCheck(sequelize: Sequelize): void {
  initRecord(Check, sequelize, 'checks', {
    revisionId: { type: DataTypes.UUID, allowNull: false },
    stepId: { type: DataTypes.UUID, allowNull: false },
    position: { type: DataTypes.INTEGER, allowNull: false },
    key: { type: DataTypes.STRING(40), allowNull: false },
    label: { type: DataTypes.STRING(120), allowNull: false },
    kind: { type: DataTypes.ENUM(...CHECK_KINDS), allowNull: false },
    unit: { type: DataTypes.STRING(8), allowNull: true },
    nominal: { type: DataTypes.DOUBLE, allowNull: true },
    lower: { type: DataTypes.DOUBLE, allowNull: true },
    upper: { type: DataTypes.DOUBLE, allowNull: true },
    decimals: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 2 },
    choices: { type: DataTypes.JSONB, allowNull: true },
    derived: { type: DataTypes.STRING(40), allowNull: true },
    derivedInputs: { type: DataTypes.JSONB, allowNull: true },
    isKey: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    isForCustomers: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
  })
}
