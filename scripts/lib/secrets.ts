import { randomBytes } from 'node:crypto'
import { chmodSync, existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs'
import type { ServiceConfig } from './serviceConfig'
import { ServiceError } from './proc'

export interface DbCredentials {
  user: string
  password: string
}

/** Contents of `$WAYMARK_DATA_DIR/secrets/db.json`. */
export interface DbSecrets {
  owner: DbCredentials
  app: DbCredentials
}

/**
 * Creates the data folder itself as 0755: the postgres user must pass through it to its own
 * folder, while every service keeps its part (and the secrets) private below it.
 */
export function ensureDataDir(config: ServiceConfig): void {
  mkdirSync(config.dataDir, { recursive: true, mode: 0o755 })
  chmodSync(config.dataDir, 0o755)
}

const randomSecret = (bytes: number) => randomBytes(bytes).toString('base64url')

function writePrivate(file: string, text: string): void {
  const tmp = `${file}.${process.pid}.tmp`
  writeFileSync(tmp, text, { mode: 0o600 })
  renameSync(tmp, file)
  chmodSync(file, 0o600)
}

function isCredentials(value: unknown, user: string): value is DbCredentials {
  const c = value as Partial<DbCredentials> | null
  // The password goes into SQL text; base64url keeps quoting a non-issue.
  return (
    !!c &&
    c.user === user &&
    typeof c.password === 'string' &&
    /^[A-Za-z0-9_-]{16,}$/.test(c.password)
  )
}

function ensureSecretsDir(config: ServiceConfig): void {
  ensureDataDir(config)
  mkdirSync(config.secretsDir, { recursive: true, mode: 0o700 })
  chmodSync(config.secretsDir, 0o700)
}

/** Reads db.json, creating it with fresh random passwords when it is missing. */
export function ensureDbSecrets(config: ServiceConfig): DbSecrets {
  ensureSecretsDir(config)
  const file = config.dbSecretsFile
  if (existsSync(file)) {
    let parsed: unknown
    try {
      parsed = JSON.parse(readFileSync(file, 'utf8'))
    } catch {
      throw new ServiceError(
        `${file} is not valid JSON; fix it or delete it to generate new passwords`,
      )
    }
    const s = parsed as Partial<DbSecrets>
    if (!isCredentials(s.owner, 'waymark_owner') || !isCredentials(s.app, 'waymark_app')) {
      throw new ServiceError(
        `${file} does not hold waymark_owner/waymark_app credentials; delete it to regenerate`,
      )
    }
    chmodSync(file, 0o600)
    return { owner: s.owner, app: s.app }
  }
  const secrets: DbSecrets = {
    owner: { user: 'waymark_owner', password: randomSecret(24) },
    app: { user: 'waymark_app', password: randomSecret(24) },
  }
  writePrivate(file, JSON.stringify(secrets))
  return secrets
}

/** Creates the session signing secret (48 random bytes, base64url) when it is missing. */
export function ensureSessionSecret(config: ServiceConfig): void {
  ensureSecretsDir(config)
  if (existsSync(config.sessionSecretFile)) {
    chmodSync(config.sessionSecretFile, 0o600)
    return
  }
  writePrivate(config.sessionSecretFile, randomSecret(48))
}

/** Reads db.json without creating it (for the scripts that only consume it). */
export function readDbSecrets(config: ServiceConfig): DbSecrets {
  if (!existsSync(config.dbSecretsFile)) {
    throw new ServiceError(
      `${config.dbSecretsFile} is missing; run \`npm run services start\` first`,
    )
  }
  return JSON.parse(readFileSync(config.dbSecretsFile, 'utf8')) as DbSecrets
}
