import { ConnectionError } from 'sequelize'

/**
 * SQLSTATEs that mean the server, not the statement, is the problem: 57P01 admin_shutdown (a
 * fast shutdown or pg_terminate_backend), 57P02 crash_shutdown, 57P03 cannot_connect_now (the
 * server is starting up or shutting down). Class 08 (connection exception) is matched apart.
 */
const SERVER_GONE_STATES = new Set(['57P01', '57P02', '57P03'])

/**
 * Socket errors of a connection attempt or of a connection that dropped. Other clients raise them
 * too; the object store's SDK marks its errors with `$metadata`, and those are not counted.
 */
const SOCKET_CODES = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'EPIPE',
  'ETIMEDOUT',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'EAI_AGAIN',
])

/**
 * What node-postgres and its pool say, without a code, when a connection ends, cannot be made in
 * time, or a reply does not come within `query_timeout`.
 */
const DROPPED_MESSAGES = [
  /^Connection terminated/,
  /is not queryable/,
  /^timeout exceeded when trying to connect/,
  /^Query read timeout/,
  /^Cannot use a pool after calling end on the pool/,
]

function isGone(e: { code?: unknown; message?: unknown; $metadata?: unknown }): boolean {
  const code = typeof e.code === 'string' ? e.code : ''
  if (SERVER_GONE_STATES.has(code) || /^08[0-9A-Z]{3}$/.test(code)) return true
  if (SOCKET_CODES.has(code)) return e.$metadata === undefined
  const message = typeof e.message === 'string' ? e.message : ''
  return DROPPED_MESSAGES.some((re) => re.test(message))
}

/**
 * Whether `err` says the database cannot be reached right now (down, restarting, the connection
 * lost mid-statement, no connection to be had in time) rather than that the statement was wrong.
 * Such a request changed nothing that was acknowledged, so the client may send it again.
 * Sequelize wraps driver errors (`parent`, `original`) and its pool's (`ConnectionError`).
 */
export function isDatabaseUnavailable(err: unknown): boolean {
  if (err instanceof ConnectionError) return true
  if (typeof err !== 'object' || err === null) return false
  const e = err as { code?: unknown; message?: unknown; parent?: unknown; original?: unknown }
  if (isGone(e)) return true
  for (const inner of [e.parent, e.original])
    if (typeof inner === 'object' && inner !== null && inner !== err && isGone(inner)) return true
  return false
}
