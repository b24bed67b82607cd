import { DataTypes } from 'sequelize'
import type { CreationOptional, Sequelize } from 'sequelize'
import { initRecord, RecordModel } from './columns'
import { ROLES } from '../../shared/roles'
import type { Role } from '../../shared/roles'

export class User extends RecordModel<User> {
  declare email: string
  declare name: string
  declare role: Role
  declare passwordHash: string
  declare isActive: CreationOptional<boolean>
  declare lastSignInAt: Date | null
  /** The code printed as a QR on the person's badge; null until one is printed. */
  declare badgeCode: CreationOptional<string | null>
  /** The bcrypt hash of the person's bench PIN; null until they set one. */
  declare pinHash: CreationOptional<string | null>
  declare pinSetAt: CreationOptional<Date | null>
}

export function initUser(sequelize: Sequelize): void {
  initRecord(User, sequelize, 'users', {
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
    passwordHash: { type: DataTypes.STRING(100), allowNull: false },
    isActive: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    lastSignInAt: { type: DataTypes.DATE, allowNull: true },
    badgeCode: { type: DataTypes.STRING(32), allowNull: true, unique: true },
    pinHash: { type: DataTypes.STRING(100), allowNull: true },
    pinSetAt: { type: DataTypes.DATE, allowNull: true },
  })
}
