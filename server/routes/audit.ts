import { z } from 'zod'
import { PageQuery } from '../../shared/schemas/common'
import { parse } from '../middleware/validate'
import { listAuditEvents } from '../services/auditLog'
import { apiRoutes } from './registry'

export const auditRoutes = apiRoutes('/audit-events')

const AuditQuery = PageQuery.extend({
  entity: z.string().max(64).optional(),
  action: z.string().max(64).optional(),
  actor: z.string().max(254).optional(),
})

auditRoutes.get('/', ['admin'], async (req, res) => {
  res.json(await listAuditEvents(parse(AuditQuery, req.query)))
})
