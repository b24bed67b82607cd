import { DataTypes } from 'sequelize'
import type { CreationOptional, NonAttribute, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { REVISION_STATUSES } from '../../shared/recipeDefinitions'
import type { InsulationClass, RevisionStatus } from '../../shared/recipeDefinitions'
import type { BomLine } from './BomLine'
import type { Product } from './Product'
import type { RouteStep } from './RouteStep'
import type { User } from './User'
import type { Winding } from './Winding'

export class Revision extends RecordModel<Revision> {
  declare productId: string
  declare letter: string
  declare status: CreationOptional<RevisionStatus>
  declare notes: CreationOptional<string>
  declare fpyThresholdPercent: CreationOptional<number>
  declare workingVolts: CreationOptional<number | null>
  declare insulation: CreationOptional<InsulationClass>
  declare copiedFromId: string | null
  declare releasedAt: Date | null
  declare releasedBy: string | null
  // associations
  declare product?: NonAttribute<Product>
  declare windings?: NonAttribute<Winding[]>
  declare steps?: NonAttribute<RouteStep[]>
  declare bomLines?: NonAttribute<BomLine[]>
  declare releaser?: NonAttribute<User | null>
  declare copiedFrom?: NonAttribute<Revision | null>
}

export function initRevision(sequelize: Sequelize): void {
  initRecord(Revision, sequelize, 'revisions', {
    productId: { type: DataTypes.UUID, allowNull: false },
    letter: { type: DataTypes.STRING(3), allowNull: false },
    status: {
      type: DataTypes.ENUM(...REVISION_STATUSES),
      allowNull: false,
      defaultValue: 'draft',
    },
    notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    fpyThresholdPercent: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 90 },
    workingVolts: { type: DataTypes.DOUBLE, allowNull: true },
    insulation: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'basic' },
    copiedFromId: { type: DataTypes.UUID, allowNull: true },
    releasedAt: { type: DataTypes.DATE, allowNull: true },
    releasedBy: { type: DataTypes.UUID, allowNull: true },
  })
}
