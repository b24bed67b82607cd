import type { NextFunction, Request, Response } from 'express'
import { MulterError } from 'multer'
import { UniqueConstraintError, ValidationError } from 'sequelize'
import type { ApiErrorBody } from '../../shared/errors'
import { isDatabaseUnavailable } from '../db/unavailable'
import { AppError } from '../errors'
import { logger } from '../logger'
import { requestFields } from './requestLog'

function toAppError(err: unknown): AppError | null {
  if (err instanceof AppError) return err
  // Down, restarting or the connection lost: nothing was acknowledged, so the client may retry.
  if (isDatabaseUnavailable(err))
    return new AppError(
      503,
      'database_unavailable',
      'the database is not reachable; try again in a moment',
    )
  if (err instanceof UniqueConstraintError) {
    const fields = Object.fromEntries(err.errors.map((e) => [e.path ?? '_', 'already in use']))
    return AppError.conflict('duplicate', 'a record with this value exists', fields)
  }
  if (err instanceof ValidationError) {
    const fields = Object.fromEntries(err.errors.map((e) => [e.path ?? '_', e.message]))
    return AppError.badRequest(err.errors[0]?.message ?? 'invalid input', fields)
  }
  if (err instanceof MulterError) {
    if (err.code === 'LIMIT_FILE_SIZE')
      return AppError.tooLarge(`${err.field ?? 'file'}: the file is over the size limit`)
    return AppError.badRequest(`${err.field ?? 'file'}: ${err.message}`, {
      [err.field ?? 'file']: err.message,
    })
  }
  const e = err as {
    status?: number
    statusCode?: number
    code?: string
    type?: string
    message?: string
  }
  const status = e.status ?? e.statusCode
  // Errors raised by middleware (body parser, csrf-sync) carry an HTTP status of their own.
  if (status === 403 && e.code === 'csrf_invalid')
    return new AppError(403, 'csrf_invalid', e.message ?? 'bad token')
  if (status === 413)
    return new AppError(413, 'too_large', 'body: the request body is over 1 MB', {
      body: 'over 1 MB',
    })
  if (status === 400 && e.type === 'entity.parse.failed')
    return AppError.badRequest('body: not valid JSON', { body: 'not valid JSON' })
  if (status === 415) {
    const problem = `send JSON in UTF-8 (${e.message ?? 'unsupported'})`
    return new AppError(415, 'unsupported_type', `body: ${problem}`, { body: problem })
  }
  // A path Express could not decode, should one get past the registry's path guard.
  if (err instanceof URIError)
    return AppError.badRequest('path: not valid percent-encoding', {
      path: 'not valid percent-encoding',
    })
  // Any other client error of the body parser (a length that does not match the body, an
  // unknown content encoding): its status, never a 500.
  if (status !== undefined && status >= 400 && status < 500 && e.type)
    return new AppError(status, 'bad_request', `body: ${e.message ?? 'unreadable'}`, {
      body: e.message ?? 'unreadable',
    })
  return null
}

/**
 * The one error middleware. Express recognises it by its four arguments and calls it for any
 * error passed to `next` or thrown by an async handler. Known errors keep their status; anything
 * else is logged with the request id and answered as a bare 500 without a stack trace.
 */
export function errorHandler(err: unknown, req: Request, res: Response, _next: NextFunction): void {
  const known = toAppError(err)
  if (known) {
    if (known.code === 'database_unavailable') {
      logger.warn({ err: (err as Error).message, req: requestFields(req) }, 'database unavailable')
      res.set('Retry-After', '1')
    }
    const body: ApiErrorBody = { error: known.code, message: known.message }
    if (known.fields) body.fields = known.fields
    if (known.details) body.details = known.details
    // For middleware that judges the answer after it is sent (the password limiters).
    res.locals.errorCode = known.code
    res.status(known.status).json(body)
    return
  }
  logger.error({ err, req: requestFields(req) }, 'unhandled error')
  res
    .status(500)
    .json({ error: 'internal', message: `something went wrong (request ${String(req.id)})` })
}

/** The JSON 404 for any /api path that no router answered; registered after every router. */
export function apiNotFound(req: Request, res: Response): void {
  res
    .status(404)
    .json({ error: 'not_found', message: `no such endpoint: ${req.method} ${req.path}` })
}
