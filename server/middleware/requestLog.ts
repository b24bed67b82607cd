import { randomUUID } from 'node:crypto'
import type { NextFunction, Request, Response } from 'express'
import { logger } from '../logger'

declare module 'http' {
  interface IncomingMessage {
    /** The request's id: stamped on its log lines and audit rows, echoed in X-Request-Id. */
    id: string
  }
}

const SANE_ID = /^[\w-]{8,64}$/

/** What a log line says of its request. */
export const requestFields = (req: Request) => ({
  id: req.id,
  method: req.method,
  url: req.originalUrl,
})

/** A success is logged at debug, a refusal at info, a failure at error. */
const levelOf = (status: number) => (status >= 500 ? 'error' : status >= 400 ? 'info' : 'debug')

/**
 * Gives every request an id (kept from a proxy's X-Request-Id when it is sane), echoes it in the
 * response so a user can quote it, and logs each finished request with its status and time.
 *
 * NOTE: this replaced pino-http, which builds a child logger with the request serialised into it
 * for every request, whether or not anything is logged: about 0.08 ms of CPU a request (a tenth
 * of a scan's) in scripts/bench/scan.ts. Here a line is built only when its level is on.
 */
export function requestLog(req: Request, res: Response, next: NextFunction): void {
  const given = req.headers['x-request-id']
  const id = typeof given === 'string' && SANE_ID.test(given) ? given : randomUUID()
  req.id = id
  res.setHeader('X-Request-Id', id)
  const started = performance.now()
  const done = () => {
    res.off('close', done)
    res.off('finish', done)
    const level = res.writableFinished ? levelOf(res.statusCode) : 'info'
    if (!logger.isLevelEnabled(level)) return
    logger[level](
      {
        req: requestFields(req),
        res: { statusCode: res.statusCode },
        responseTime: Math.round(performance.now() - started),
      },
      res.writableFinished ? 'request completed' : 'request aborted',
    )
  }
  res.on('finish', done)
  res.on('close', done)
  next()
}
