import { randomUUID } from 'node:crypto'
import { pinoHttp } from 'pino-http'
import { logger } from '../logger'

/**
 * Gives every request an id (kept from a proxy's X-Request-Id when it is sane) and a child logger
 * that stamps it on each line; the id is echoed in the response so a user can quote it.
 */
export const requestLog = pinoHttp({
  logger,
  genReqId: (req, res) => {
    const given = req.headers['x-request-id']
    const id = typeof given === 'string' && /^[\w-]{8,64}$/.test(given) ? given : randomUUID()
    res.setHeader('X-Request-Id', id)
    return id
  },
  customLogLevel: (_req, res, err) =>
    err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'info' : 'debug',
  serializers: {
    req: (req: { id: string; method: string; url: string }) => ({
      id: req.id,
      method: req.method,
      url: req.url,
    }),
    res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
  },
})
