import { Router } from 'express'
import type { RequestHandler } from 'express'
import { guard } from '../middleware/access'
import type { Access } from '../middleware/access'
import { pathEncodingGuard, routeChecks } from '../middleware/requestChecks'

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete'

/** One API route and who may call it; the role-matrix test compares these with its own table. */
export interface RegisteredRoute {
  method: Method
  path: string
  access: Access
}

/** Every route registered through `apiRoutes`, in registration order. */
export const registeredRoutes: RegisteredRoute[] = []

/** Every router made by `apiRoutes`, with its mount path, so tests can find unguarded routes. */
export const apiRouters: { base: string; router: Router }[] = []

/**
 * A router for `/api<base>` whose every route must name its access rule; the guard runs before
 * any handler, so a forgotten check cannot leave a route open.
 */
export function apiRoutes(base: string) {
  const router = Router()
  apiRouters.push({ base, router })
  const add =
    (method: Method) =>
    (path: string, access: Access, ...handlers: RequestHandler[]) => {
      registeredRoutes.push({ method, path: `/api${base}${path === '/' ? '' : path}`, access })
      // After the guard, so a caller who may not use the route learns nothing from its checks.
      const checks = routeChecks(method, path, handlers)
      router[method](path, guard(access), ...(checks ? [checks] : []), ...handlers)
    }
  return {
    router,
    get: add('get'),
    post: add('post'),
    put: add('put'),
    patch: add('patch'),
    delete: add('delete'),
  }
}

/**
 * The guard for the percent-encoding of every route's path, mounted before the routers: a
 * parameter Express cannot decode is a 400 naming it (see `pathEncodingGuard`).
 */
export function pathGuard(): RequestHandler {
  return pathEncodingGuard(registeredRoutes.map((r) => r.path))
}
