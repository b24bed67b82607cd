import { rateLimit } from 'express-rate-limit'
import type { Request } from 'express'
import { RedisStore } from 'rate-limit-redis'
import type { RedisReply } from 'rate-limit-redis'
import { AppError } from '../errors'
import { redisConnection, redisPrefix } from '../redis'

const WINDOW_MS = 15 * 60 * 1000
/** Failed sign-ins allowed per address and per account in 15 minutes. */
export const SIGN_IN_LIMITS = { perIp: 30, perAccount: 8, windowMs: WINDOW_MS }

// Counters live in Redis so that every API process counts the same attempts.
function store(name: string) {
  return new RedisStore({
    prefix: `${redisPrefix}:rl:${name}:`,
    sendCommand: (command: string, ...args: string[]) =>
      redisConnection().call(command, ...args) as Promise<RedisReply>,
  })
}

function accountKey(req: Request): string {
  const email: unknown = (req.body as { email?: unknown } | undefined)?.email
  return typeof email === 'string' ? email.trim().toLowerCase() : 'none'
}

const tooMany = () => {
  throw new AppError(
    429,
    'too_many_attempts',
    'too many sign-in attempts: wait 15 minutes or ask an admin',
  )
}

/** Limits failed sign-ins per client address and, separately, per e-mail address tried. */
export function signInLimiters() {
  const common = {
    windowMs: WINDOW_MS,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8' as const,
    legacyHeaders: false,
    handler: tooMany,
  }
  return [
    rateLimit({ ...common, limit: SIGN_IN_LIMITS.perIp, store: store('ip') }),
    rateLimit({
      ...common,
      limit: SIGN_IN_LIMITS.perAccount,
      store: store('account'),
      keyGenerator: accountKey,
    }),
  ]
}
