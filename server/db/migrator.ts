import { dirname, join } from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { Sequelize } from 'sequelize'
import type { QueryInterface } from 'sequelize'
import { SequelizeStorage, Umzug } from 'umzug'
import { env, requireSetting } from '../env'
import { logger } from '../logger'

/** What every migration receives: the query interface and the name of the app's DML-only role. */
export interface MigrationContext {
  queryInterface: QueryInterface
  sequelize: Sequelize
  appRole: string
}

export interface Migration {
  up: (params: { context: MigrationContext }) => Promise<void>
  down: (params: { context: MigrationContext }) => Promise<void>
}

const migrationsDir = join(dirname(fileURLToPath(import.meta.url)), 'migrations')

/** A connection as the role that owns the schema; only migrations and resets use it. */
export function ownerConnection(): Sequelize {
  return new Sequelize(requireSetting(env.ownerDatabaseUrl, 'the owner database URL'), {
    dialect: 'postgres',
    logging: false,
  })
}

/** An umzug migrator over `server/db/migrations/*.ts`, recording what ran in `schema_migrations`. */
export function migrator(sequelize: Sequelize): Umzug<MigrationContext> {
  return new Umzug<MigrationContext>({
    migrations: {
      glob: ['*.ts', { cwd: migrationsDir, ignore: ['*.d.ts'] }],
      resolve: ({ name, path }) => ({
        name,
        up: async (params) => ((await import(pathToFileURL(path!).href)) as Migration).up(params),
        down: async (params) =>
          ((await import(pathToFileURL(path!).href)) as Migration).down(params),
      }),
    },
    context: { queryInterface: sequelize.getQueryInterface(), sequelize, appRole: env.appDbRole },
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: {
      info: (m) => logger.debug(m),
      warn: (m) => logger.warn(m),
      error: (m) => logger.error(m),
      debug: () => {},
    },
  })
}

/**
 * Drops every table and type of the test database and recreates the empty schema. Refuses any
 * database whose name does not end in `_test`, so a slip of the environment cannot wipe real data.
 */
export async function resetTestSchema(sequelize: Sequelize): Promise<void> {
  const [[row]] = (await sequelize.query('SELECT current_database() AS name')) as [
    { name: string }[],
    unknown,
  ]
  if (!row.name.endsWith('_test'))
    throw new Error(`refusing to reset database ${row.name}: not a test database`)
  await sequelize.query('DROP SCHEMA IF EXISTS public CASCADE')
  await sequelize.query('CREATE SCHEMA public')
}
