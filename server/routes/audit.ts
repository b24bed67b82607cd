import { AuditQuery } from '../../shared/schemas/audit'
import { parse } from '../middleware/validate'
import { auditTable, listAuditEvents } from '../services/admin'
import { writeCsv } from '../csv'
import { apiRoutes } from './registry'

export const auditRoutes = apiRoutes('/audit-events')

auditRoutes.get('/', ['admin'], async (req, res) => {
  const query = parse(AuditQuery, req.query)
  if (query.format === 'json') {
    res.json(await listAuditEvents(query))
    return
  }
  const table = await auditTable(query)
  const day = new Date().toISOString().slice(0, 10)
  res.setHeader('Content-Disposition', `attachment; filename="audit-log-${day}.csv"`)
  // Says so when the export stopped at its row limit, so nobody mistakes it for the whole log.
  res.setHeader('X-Waymark-Truncated', table.isTruncated ? 'yes' : 'no')
  res.type('text/csv').send(writeCsv([table.header, ...table.records]))
})
