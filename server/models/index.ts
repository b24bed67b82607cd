import { Sequelize } from 'sequelize'
import { env, requireSetting } from '../env'
import { logger } from '../logger'
import { AuditEvent, initAuditEvent } from './AuditEvent'
import { initStation, Station } from './Station'
import { initUser, User } from './User'

export { AuditEvent, Station, User }

let instance: Sequelize | undefined

/** The app's Sequelize instance (connected as the app's own, non-owner role), made on first use. */
export function db(): Sequelize {
  if (instance) return instance
  instance = new Sequelize(requireSetting(env.databaseUrl, 'the database URL'), {
    dialect: 'postgres',
    logging: (sql) => logger.trace({ sql }, 'sql'),
    pool: { max: 10, idle: 10_000 },
    define: { underscored: true },
  })
  initUser(instance)
  initStation(instance)
  initAuditEvent(instance)
  // associations
  AuditEvent.belongsTo(User, { as: 'actor', foreignKey: 'actorId', constraints: false })
  return instance
}

/** Closes the pool; used by shutdown and by tests. */
export async function closeDb(): Promise<void> {
  if (!instance) return
  await instance.close()
  instance = undefined
}
