import type { NextFunction, Request, RequestHandler, Response } from 'express'
import { MulterError } from 'multer'
import { isScannedCode } from '../../shared/links'
import { IdParam, textProblem } from '../../shared/schemas/common'
import { AppError } from '../errors'

/**
 * Checks of a request's shape that every route shares, so that bad input is a 400 or 415 that
 * names the field or parameter before any handler runs, never a 5xx from deeper down.
 */

/** The `:name` parameters of a route path, in order. */
export function paramNames(path: string): string[] {
  return [...path.matchAll(/:(\w+)/g)].map((m) => m[1]!)
}

function decoded(segment: string): string | null {
  try {
    return decodeURIComponent(segment)
  } catch {
    return null
  }
}

/**
 * What a path segment's percent-encoding gets wrong, or null: Express decodes every parameter
 * before it matches a route, and answers a segment that is not UTF-8 (`%E0%A4%A`, `%ED%A0%80`)
 * with an error of its own; a NUL (`%00`) would reach the database.
 */
function segmentProblem(segment: string): string | null {
  if (!segment.includes('%')) return null
  const value = decoded(segment)
  if (value === null) return 'not valid percent-encoding (UTF-8 bytes as %XX)'
  return textProblem(value)
}

/**
 * The one guard for path encoding, before any router matches: a segment that does not decode
 * is a 400 naming the route's parameter at that place (or `path` when no route has one there).
 * `paths` are the full paths of every route (`/api/lots/:id`); `req.path` is below `/api`.
 */
export function pathEncodingGuard(paths: readonly string[]): RequestHandler {
  const patterns = paths.map((p) => p.replace(/^\/api/, '').split('/'))
  return (req: Request, _res: Response, next: NextFunction) => {
    const path = req.path
    if (!path.includes('%')) return next()
    const segments = path.split('/')
    const bad = segments.findIndex((s) => segmentProblem(s) !== null)
    if (bad < 0) return next()
    const route = patterns.find(
      (p) =>
        p.length === segments.length &&
        p[bad]!.startsWith(':') &&
        p.every((part, i) => part.startsWith(':') || part === segments[i]),
    )
    const name = route ? route[bad]!.slice(1) : 'path'
    const problem = segmentProblem(segments[bad]!)!
    next(AppError.badRequest(`${name}: ${problem}`, { [name]: problem }))
  }
}

/** The problem with one decoded path parameter, by its name, or null. */
function paramProblem(name: string, value: string): string | null {
  if (name === 'id') return IdParam.safeParse(value).success ? null : 'not a valid id'
  if (name === 'serial') return isScannedCode(value) ? null : 'not a serial'
  if (name === 'code')
    return isScannedCode(value) ? null : 'not a code (letters, digits and hyphens)'
  return textProblem(value)
}

const MULTIPART = Symbol('multipart upload')
type UploadHandler = RequestHandler & { [MULTIPART]?: true }

/**
 * A multer middleware as an upload route uses it: marks the route as taking multipart (so
 * the route's checks accept that content type, and only that), and answers a malformed form
 * (no boundary, a body cut off, a broken part header) or a file name that cannot be stored
 * with a 400 naming the file field, where multer would pass on a bare error.
 */
export function multipartUpload(upload: RequestHandler, field = 'file'): RequestHandler {
  const handler: UploadHandler = (req, res, next) => {
    upload(req, res, (err?: unknown) => {
      if (err instanceof MulterError || err instanceof AppError) return next(err)
      if (err) {
        const reason = err instanceof Error ? err.message : String(err)
        const problem = `not a well-formed multipart form (${reason})`
        return next(AppError.badRequest(`${field}: ${problem}`, { [field]: problem }))
      }
      const name = req.file?.originalname
      const nameProblem = name === undefined ? null : textProblem(name)
      if (nameProblem) {
        const problem = `the file name ${nameProblem}`
        return next(AppError.badRequest(`${field}: ${problem}`, { [field]: problem }))
      }
      next()
    })
  }
  handler[MULTIPART] = true
  return handler
}

/** Whether a request carries a body (a length over zero, or a chunked one). */
function hasBody(req: Request): boolean {
  if (req.headers['transfer-encoding'] !== undefined) return true
  const length = Number(req.headers['content-length'] ?? 0)
  return Number.isFinite(length) && length > 0
}

/**
 * The checks of one route, run after its access guard: the body's content type (JSON, or
 * multipart on an upload route: anything else is a 415, not a body quietly left unread) and the
 * shape of its `:id`, `:serial` and `:code` parameters. Null when the route has nothing to check.
 */
export function routeChecks(
  method: string,
  path: string,
  handlers: readonly RequestHandler[],
): RequestHandler | null {
  const names = paramNames(path)
  const takesBody = method !== 'get'
  if (!takesBody && names.length === 0) return null
  const multipart = handlers.some((h) => (h as UploadHandler)[MULTIPART] === true)
  return (req, _res, next) => {
    if (takesBody && hasBody(req)) {
      const want = multipart ? 'multipart/form-data' : 'application/json'
      if (!req.is(want)) {
        const problem = multipart ? 'send the file as multipart/form-data' : 'send JSON'
        return next(
          new AppError(415, 'unsupported_type', `body: ${problem}`, {
            body: `${problem}, not ${req.headers['content-type'] ?? 'an unnamed type'}`,
          }),
        )
      }
    }
    for (const name of names) {
      const value = req.params[name]
      const problem = typeof value === 'string' ? paramProblem(name, value) : null
      if (problem) return next(AppError.badRequest(`${name}: ${problem}`, { [name]: problem }))
    }
    next()
  }
}
