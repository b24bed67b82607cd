import { MemoryStore, rateLimit } from 'express-rate-limit'
import type { IncrementResponse, Options, Store } from 'express-rate-limit'
import type { Request, RequestHandler, Response } from 'express'
import { RedisStore } from 'rate-limit-redis'
import type { RedisReply } from 'rate-limit-redis'
import { AppError } from '../errors'
import { logger } from '../logger'
import { redisConnection, redisPrefix } from '../redis'

const WINDOW_MS = 15 * 60 * 1000
/**
 * Wrong passwords allowed per client address and per account in 15 minutes, counted together
 * wherever a password is typed: sign-in and a second person's countersign at the bench.
 */
export const PASSWORD_LIMITS = { perIp: 30, perAccount: 8, windowMs: WINDOW_MS }
/** The same limits under the name the sign-in tests know. */
export const SIGN_IN_LIMITS = PASSWORD_LIMITS

/**
 * The error codes that mean "a password was wrong" (or the limit was already reached): only
 * these answers count against the limits, so a scan refused for another reason does not use up
 * the budget of the engineer whose countersign it carried.
 */
const PASSWORD_REFUSALS = new Set([
  'invalid_credentials',
  'countersign_rejected',
  'password_rejected',
  'too_many_attempts',
])

/**
 * Counts in Redis and, while Redis cannot be reached, in this process's memory: a Redis outage
 * must neither stop people signing in or countersigning at the bench (scans go on recording) nor
 * lift the limits. During an outage each API process counts on its own, so the limits hold per
 * process; the Redis counters take over again with the next request once it answers.
 */
export class RedisOrMemoryStore implements Store {
  private readonly memory = new MemoryStore()
  private isDown = false

  constructor(
    private readonly redis: Store,
    private readonly name: string,
  ) {}

  private options: Options | undefined
  /** Whether the Redis store has loaded its scripts since it last failed. */
  private isRedisReady = false

  init(options: Options): void {
    this.options = options
    this.memory.init(options)
    // Redis may be away at start-up: the store's own init (loading its scripts) then fails, and
    // is tried again before the next count instead of leaving the store broken until a restart.
    void this.readyRedis().catch(() => undefined)
  }

  private async readyRedis(): Promise<void> {
    if (this.isRedisReady) return
    await this.redis.init?.(this.options!)
    this.isRedisReady = true
  }

  private async either<T>(onRedis: () => Promise<T> | T, onMemory: () => Promise<T> | T) {
    try {
      await this.readyRedis()
      const value = await onRedis()
      if (this.isDown) logger.info({ limiter: this.name }, 'password limits counted in redis again')
      this.isDown = false
      return value
    } catch (err) {
      if (!this.isDown)
        logger.warn(
          { err: (err as Error).message, limiter: this.name },
          'redis unreachable: password limits counted in this process until it returns',
        )
      this.isDown = true
      this.isRedisReady = false
      return onMemory()
    }
  }

  increment(key: string): Promise<IncrementResponse> {
    return this.either(
      () => this.redis.increment(key),
      () => this.memory.increment(key),
    )
  }

  decrement(key: string): Promise<void> {
    return this.either(
      () => this.redis.decrement(key),
      () => this.memory.decrement(key),
    )
  }

  resetKey(key: string): Promise<void> {
    return this.either(
      () => this.redis.resetKey(key),
      () => this.memory.resetKey(key),
    )
  }

  shutdown(): void {
    this.memory.shutdown()
  }
}

// Counters live in Redis so that every API process counts the same attempts. Each limiter gets
// its own store object (express-rate-limit refuses to share one), but the same key prefix, so
// every password check in the app adds to the same two counters.
function store(name: 'ip' | 'account'): Store {
  const redis = new RedisStore({
    prefix: `${redisPrefix}:rl:${name}:`,
    sendCommand: (command: string, ...args: string[]) =>
      redisConnection().call(command, ...args) as Promise<RedisReply>,
  })
  return new RedisOrMemoryStore(redis, name)
}

const normalEmail = (email: unknown) =>
  typeof email === 'string' ? email.trim().toLowerCase() : null

const tooMany = () => {
  throw new AppError(
    429,
    'too_many_attempts',
    'too many wrong passwords: wait 15 minutes or ask an admin',
  )
}

/** Whether the answer refused a password; read by the limiters once the response is sent. */
function wasPasswordRefused(res: Response): boolean {
  const code: unknown = (res.locals as { errorCode?: unknown }).errorCode
  return typeof code === 'string' && PASSWORD_REFUSALS.has(code)
}

/**
 * The one limiter of password checks: per client address and, separately, per account tried.
 * `accountOf` reads the e-mail of the account whose password the request carries, or null when
 * it carries none (then the request is not counted and does not touch Redis). A request is
 * counted first and the count given back unless the answer refused the password, so parallel
 * guesses cannot slip past the limit; over the limit even the right password gets a 429.
 */
export function passwordLimiters(accountOf: (req: Request) => string | null): RequestHandler[] {
  const common = {
    windowMs: WINDOW_MS,
    skip: (req: Request) => accountOf(req) === null,
    skipSuccessfulRequests: true,
    requestWasSuccessful: (_req: Request, res: Response) => !wasPasswordRefused(res),
    standardHeaders: 'draft-8' as const,
    legacyHeaders: false,
    handler: tooMany,
  }
  return [
    rateLimit({ ...common, limit: PASSWORD_LIMITS.perIp, store: store('ip') }),
    rateLimit({
      ...common,
      limit: PASSWORD_LIMITS.perAccount,
      store: store('account'),
      keyGenerator: (req) => accountOf(req) ?? 'none',
    }),
  ]
}

/** Limits failed sign-ins per client address and per e-mail address tried. */
export function signInLimiters(): RequestHandler[] {
  return passwordLimiters(
    (req) => normalEmail((req.body as { email?: unknown } | undefined)?.email) ?? 'none',
  )
}

/**
 * Limits a second person's password typed at the bench (a step's countersign, a use-as-is or
 * keep decision), counted with sign-ins. Requests without a countersign pass untouched.
 */
export function countersignLimiters(): RequestHandler[] {
  return passwordLimiters((req) => {
    const countersign: unknown = (req.body as { countersign?: unknown } | undefined)?.countersign
    if (typeof countersign !== 'object' || countersign === null) return null
    const { email, badge } = countersign as { email?: unknown; badge?: unknown }
    // A badge counts against itself as an e-mail does: a guessed PIN is slowed like a password.
    if (typeof badge === 'string') return `badge:${badge.trim().toUpperCase().slice(0, 64)}`
    return normalEmail(email) ?? 'none'
  })
}

/**
 * Limits a signed-in person's own password, re-typed to confirm a change such as a new bench
 * PIN, counted with sign-ins under their e-mail: a session left open is no way to guess it.
 */
export function ownPasswordLimiters(): RequestHandler[] {
  return passwordLimiters((req) =>
    normalEmail((req.user as { email?: unknown } | undefined)?.email),
  )
}
