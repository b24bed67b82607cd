import pg from 'pg'
import { CONNECT_TIMEOUT_MS, env, requireSetting } from '../../env'
import { logger } from '../../logger'

/**
 * An in-memory cache of session rows and signed-in users, so that a signed-in request does not
 * read both from PostgreSQL every time (two round trips, half the cost of a scan on the Floor).
 *
 * It stays correct with several API processes because PostgreSQL tells every process about each
 * change: triggers on `sessions` and `users` (migration 20261202160100) send a NOTIFY on the
 * `waymark_auth` channel, and a dedicated connection here LISTENs and forgets the entry. The cache
 * is used only while that connection is listening; when it drops, everything is forgotten and
 * every request reads the database until it listens again. A change made by this process is
 * also forgotten at once, without waiting for its own notification.
 */

const CHANNEL = 'waymark_auth'
/** An upper bound on staleness even if a notification were missed. */
const TTL_MS = 60_000
const MAX_ENTRIES = 10_000
const RECONNECT_MS = 2_000

interface Entry<T> {
  value: T
  until: number
}

/** A bounded map of entries that expire; the oldest entry goes first when it is full. */
class ExpiringMap<T> {
  private readonly entries = new Map<string, Entry<T>>()

  get(key: string): T | undefined {
    const hit = this.entries.get(key)
    if (!hit) return undefined
    if (hit.until > Date.now()) return hit.value
    this.entries.delete(key)
    return undefined
  }

  set(key: string, value: T, until: number): void {
    if (this.entries.size >= MAX_ENTRIES) {
      const oldest = this.entries.keys().next()
      if (!oldest.done) this.entries.delete(oldest.value)
    }
    this.entries.delete(key)
    this.entries.set(key, { value, until })
  }

  delete(key: string): void {
    this.entries.delete(key)
  }

  clear(): void {
    this.entries.clear()
  }
}

/** Session rows as JSON text (each get parses a fresh copy, since express-session mutates it). */
const sessions = new ExpiringMap<string>()
const users = new ExpiringMap<unknown>()
let listener: pg.Client | null = null
let isListening = false
let isStopped = false
/**
 * Bumped by every invalidation. A read that started before an invalidation must not be stored
 * after it: the row it read may be the one just changed.
 */
let generation = 0

function forgetAll(): void {
  generation++
  sessions.clear()
  users.clear()
}

function onNotice(payload: string | undefined): void {
  generation++
  const [kind, key] = (payload ?? '').split(':', 2) as [string, string | undefined]
  if (kind === 'session' && key) sessions.delete(key)
  else if (kind === 'user' && key) {
    users.delete(key)
    // The user's sessions may have been ended with the change (deactivation, new password).
    sessions.clear()
  } else forgetAll()
}

async function listen(): Promise<void> {
  if (listener || isStopped) return
  const client = new pg.Client({
    connectionString: requireSetting(env.databaseUrl, 'the database URL'),
    // A connection attempt while the database is away must fail, and be tried again, in bounded
    // time; keep-alive notices a listener whose server vanished without closing the socket.
    connectionTimeoutMillis: CONNECT_TIMEOUT_MS,
    keepAlive: true,
  })
  listener = client
  const lost = (err?: unknown) => {
    if (listener !== client) return
    if (err) logger.warn({ err }, 'auth cache: lost the notification channel; reading the database')
    isListening = false
    listener = null
    forgetAll()
    void client.end().catch(() => undefined)
    if (!isStopped) setTimeout(() => void listen(), RECONNECT_MS).unref()
  }
  client.on('error', lost)
  client.on('end', () => lost())
  client.on('notification', (msg) => onNotice(msg.payload))
  try {
    await client.connect()
    await client.query(`LISTEN ${CHANNEL}`)
    // Anything cached before now was read without a listener.
    forgetAll()
    isListening = listener === client
  } catch (err) {
    lost(err)
  }
}

/** Whether the cache is in use: only while changes reach it. */
export function isAuthCacheLive(): boolean {
  if (!listener && !isStopped) void listen()
  return isListening
}

/**
 * Reads through the cache: `load` runs on a miss, and its result is kept (until `untilOf` of it,
 * at most the TTL) unless something changed while it ran. A null result is not kept.
 */
async function readThrough<T>(
  map: ExpiringMap<T>,
  key: string,
  load: () => Promise<T | null>,
  untilOf: (value: T) => number = () => Infinity,
): Promise<T | null> {
  const live = isAuthCacheLive()
  if (live) {
    const hit = map.get(key)
    if (hit !== undefined) return hit
  }
  const startedAt = generation
  const value = await load()
  if (live && value !== null && isListening && generation === startedAt)
    map.set(key, value, Math.min(Date.now() + TTL_MS, untilOf(value)))
  return value
}

/** The session row's JSON through the cache; `expiresAt` bounds how long it is kept. */
export function cachedSession(
  sid: string,
  load: () => Promise<string | null>,
  expiresAt: (json: string) => number,
): Promise<string | null> {
  return readThrough(sessions, sid, load, expiresAt)
}

/** The signed-in user through the cache. */
export function cachedUser<T>(id: string, load: () => Promise<T | null>): Promise<T | null> {
  return readThrough(users as ExpiringMap<T>, id, load)
}

/** Forgets one session at once (this process saved or destroyed it). */
export function forgetSession(sid: string): void {
  generation++
  sessions.delete(sid)
}

/** Forgets every user and session at once (this process changed a user). */
export function forgetUsers(): void {
  forgetAll()
}

/** Closes the notification channel (shutdown, tests); a later request opens it again. */
export async function closeAuthCache(): Promise<void> {
  isStopped = true
  const client = listener
  listener = null
  isListening = false
  forgetAll()
  await client?.end().catch(() => undefined)
  isStopped = false
}
