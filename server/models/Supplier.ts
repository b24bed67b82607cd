import { DataTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'

/** A company that sends component lots; one record per name whatever its case or spacing. */
export class Supplier extends RecordModel<Supplier> {
  declare name: string
}

export function initSupplier(sequelize: Sequelize): void {
  initRecord(Supplier, sequelize, 'suppliers', {
    name: { type: DataTypes.STRING(120), allowNull: false },
  })
}
