import type { ServiceConfig } from './serviceConfig'
import { serviceConfig } from './serviceConfig'
import { ensurePackages } from './debian'
import type { ServiceState } from './postgres'
import { postgresState, startPostgres, stopPostgres } from './postgres'
import { provisionPostgres } from './pgProvision'
import { redisState, startRedis, stopRedis } from './redis'
import { s3State, startS3, stopS3 } from './s3'
import type { DbSecrets } from './secrets'
import { smtpState, startSmtp, stopSmtp } from './smtp'
import { ensureDbSecrets, ensureSessionSecret } from './secrets'

export interface ServicesOptions {
  config?: ServiceConfig
  /** Progress output; defaults to console.log. */
  log?: (line: string) => void
}

export interface StartedServices {
  config: ServiceConfig
  secrets: DbSecrets
}

/**
 * Installs missing Debian packages (as root), then starts PostgreSQL, Redis, the S3 fake and
 * the SMTP fake on loopback and provisions roles, databases and buckets. Idempotent: running services are
 * reused, never duplicated. Throws ServiceError with a readable message on failure.
 */
export async function startServices(opts: ServicesOptions = {}): Promise<StartedServices> {
  const log = opts.log ?? console.log
  await ensurePackages(['postgresql', 'redis-server'], log)
  const config = opts.config ?? serviceConfig()
  const secrets = ensureDbSecrets(config)
  ensureSessionSecret(config)
  await startPostgres(config, log)
  await provisionPostgres(config, secrets, log)
  await startRedis(config, log)
  await startS3(config, log)
  await startSmtp(config, log) // files mail in the database and the object store: start it last
  return { config, secrets }
}

/** Stops the services this project started (by their pid files); leaves others alone. */
export async function stopServices(opts: ServicesOptions = {}): Promise<void> {
  const log = opts.log ?? console.log
  const config = opts.config ?? serviceConfig()
  await stopSmtp(config, log)
  await stopS3(config, log)
  await stopRedis(config, log)
  await stopPostgres(config, log)
}

/** One state per service, read from pid files and liveness probes. */
export function servicesStatus(config: ServiceConfig = serviceConfig()): ServiceState[] {
  return [postgresState(config), redisState(config), s3State(config), smtpState(config)]
}
