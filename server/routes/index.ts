import { Router } from 'express'
import { auditRoutes } from './audit'
import { authRoutes } from './auth'
import { componentLotRoutes, supplierRoutes } from './componentLots'
import { healthRoutes } from './health'
import { defectCodeRoutes, partRoutes } from './parts'
import { productRoutes } from './products'
import { bomLineRoutes, checkRoutes, stepRoutes, windingRoutes } from './recipeParts'
import { apiRouters, pathGuard } from './registry'
import { revisionRoutes } from './revisions'
import { stationRoutes } from './stations'
import { userRoutes } from './users'
import { outboxRoutes } from './outbox'
import { lotRoutes } from './lots'
import { floorRoutes } from './floor'
import { stepRunRoutes } from './stepRuns'
import { nonconformanceRoutes } from './nonconformances'
import { documentRoutes } from './documents'
import { yieldRoutes } from './yield'
import { exportRoutes } from './exports'
import { alertRoutes } from './alerts'
import { importMappingRoutes, importRoutes } from './imports'
import { customerRoutes } from './customers'
import { shipmentRoutes, unitDocumentRoutes } from './shipments'
import { serviceCaseRoutes } from './serviceCases'
import { traceRoutes } from './trace'
import { searchRoutes } from './search'
import { statusRoutes } from './status'

// Importing the route modules above registers them in `apiRouters`; mount them all in order.
void [
  auditRoutes,
  authRoutes,
  healthRoutes,
  stationRoutes,
  userRoutes,
  productRoutes,
  revisionRoutes,
]
void [
  stepRoutes,
  checkRoutes,
  windingRoutes,
  bomLineRoutes,
  partRoutes,
  defectCodeRoutes,
  componentLotRoutes,
  supplierRoutes,
]

void [lotRoutes, floorRoutes, stepRunRoutes, nonconformanceRoutes, documentRoutes, yieldRoutes]

void [outboxRoutes, exportRoutes, traceRoutes]

void [alertRoutes]
void [importRoutes, importMappingRoutes]
void [customerRoutes, shipmentRoutes, unitDocumentRoutes, serviceCaseRoutes]
void [searchRoutes, statusRoutes]

/**
 * The /api router: every router made with `apiRoutes`, at its base path. The routers are grouped
 * by the first segment of their base and a request goes straight to its group: Express tries a
 * router's layers one after another, and thirty mounts tried in turn cost every request (the
 * scan's came twentieth) more than its own handler did.
 */
export function apiRouter(): Router {
  const groups = new Map<string, Router>()
  for (const { base, router } of apiRouters) {
    const segment = firstSegment(base)
    let group = groups.get(segment)
    if (!group) groups.set(segment, (group = Router()))
    group.use(base, router)
  }
  const api = Router()
  api.use(pathGuard())
  api.use((req, res, next) => {
    const group = groups.get(firstSegment(req.path))
    if (group) group(req, res, next)
    else next()
  })
  return api
}

/** `steps` of `/steps/abc`. */
const firstSegment = (path: string) => path.split('/', 2)[1] ?? ''
