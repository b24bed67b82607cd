import { readFileSync } from 'node:fs'
import { execute } from '../../db/sql'
import { redisConnection } from '../../redis'
import { checkStorage } from '../../storage'

const version = (
  JSON.parse(readFileSync(new URL('../../../package.json', import.meta.url), 'utf8')) as {
    version: string
  }
).version

type PartState = 'ok' | 'down'
export interface Health {
  status: 'ok' | 'degraded'
  db: PartState
  redis: PartState
  storage: PartState
  version: string
}

function withTimeout(p: Promise<unknown>, ms: number): Promise<PartState> {
  return Promise.race([
    p.then(() => 'ok' as const),
    new Promise<PartState>((resolve) => setTimeout(() => resolve('down'), ms).unref()),
  ]).catch(() => 'down' as const)
}

/** Asks each part once, each within 2 s, so a hung part reports down instead of hanging the check. */
export async function checkHealth(): Promise<Health> {
  const [dbState, redisState, storageState] = await Promise.all([
    withTimeout(execute('SELECT 1'), 2000),
    withTimeout(redisConnection().ping(), 2000),
    withTimeout(checkStorage(), 2000),
  ])
  const isOk = dbState === 'ok' && redisState === 'ok' && storageState === 'ok'
  return {
    status: isOk ? 'ok' : 'degraded',
    db: dbState,
    redis: redisState,
    storage: storageState,
    version,
  }
}
