import { PageQuery, text } from '../../shared/schemas/common'
import { parse } from '../middleware/validate'
import { listAuditEvents } from '../services/admin'
import { apiRoutes } from './registry'

export const auditRoutes = apiRoutes('/audit-events')

const AuditQuery = PageQuery.extend({
  entity: text().max(64).optional(),
  action: text().max(64).optional(),
  actor: text().max(254).optional(),
})

auditRoutes.get('/', ['admin'], async (req, res) => {
  res.json(await listAuditEvents(parse(AuditQuery, req.query)))
})
