import type { NextFunction, Request, Response } from 'express'
import type { Role } from '../../shared/roles'
import type { UserDto } from '../../shared/schemas/auth'
import { AppError } from '../errors'
import type { Actor } from '../services/admin'

/** Who may call a route: nobody signed in, anybody signed in, or the listed roles. */
export type Access = 'public' | 'signed_in' | readonly Role[]

/** The signed-in user of a request; passport puts it on `req.user`. */
export function currentUser(req: Request): UserDto | undefined {
  return req.user as UserDto | undefined
}

/** The signed-in user, for handlers behind a guard; a 401 if somehow absent. */
export function signedInUser(req: Request): UserDto {
  const user = currentUser(req)
  if (!user) throw AppError.unauthenticated()
  return user
}

/** The acting user with the request's address and id, for the audit log. */
export function actorOf(req: Request): Actor {
  const user = currentUser(req)
  return {
    id: user?.id ?? null,
    email: user?.email ?? null,
    ip: req.ip ?? null,
    requestId: String(req.id),
  }
}

/** A guard: 401 when signed out, 403 when the user's role is not listed. */
export function requireRole(...roles: Role[]) {
  return guard(roles)
}

/** The guard for any access rule; `public` lets everybody through. */
export function guard(access: Access) {
  return (req: Request, _res: Response, next: NextFunction) => {
    if (access === 'public') return next()
    const user = currentUser(req)
    if (!user) return next(AppError.unauthenticated())
    if (access !== 'signed_in' && !access.includes(user.role)) return next(AppError.forbidden())
    next()
  }
}
