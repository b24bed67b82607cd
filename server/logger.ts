import { pino } from 'pino'
import { env } from './env'

/** The one logger; requestLog.ts logs each request with its id. */
export const logger = pino({
  level: env.LOG_LEVEL ?? (env.isTest ? 'warn' : 'info'),
  base: { service: 'waymark' },
  redact: ['req.headers.cookie', 'req.headers["x-csrf-token"]', 'password', 'passwordHash'],
})
