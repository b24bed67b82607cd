import type { Response } from 'express'
import { IdParam } from '../../shared/schemas/common'
import { ExportFormatQuery } from '../../shared/schemas/exports'
import type { ExportFormat } from '../../shared/schemas/exports'
import { YieldSummaryQuery } from '../../shared/schemas/yield'
import { PERMISSIONS } from '../../shared/permissions'
import { parse } from '../middleware/validate'
import {
  CONTENT_TYPES,
  lotMeasurementsExport,
  lotTableExport,
  renderExport,
} from '../services/exports'
import type { ExportTable } from '../services/exports'
import { apiRoutes } from './registry'

export const exportRoutes = apiRoutes('/exports')
const read = PERMISSIONS.readYield

async function send(res: Response, table: ExportTable, format: ExportFormat) {
  const file = await renderExport(table, format)
  const name = `${table.filename}.${format}`.replace(/[^A-Za-z0-9._-]/g, '_')
  res.type(CONTENT_TYPES[format])
  res.setHeader('Content-Disposition', `attachment; filename="${name}"`)
  res.setHeader('Cache-Control', 'no-store')
  res.send(file)
}

/** The lots table of the Yield board, with its period and product/revision filters. */
exportRoutes.get('/lots', read, async (req, res) => {
  const { format } = parse(ExportFormatQuery, req.query)
  await send(res, await lotTableExport(parse(YieldSummaryQuery, req.query)), format)
})
/** Every step run of a lot with its readings, one column per check. */
exportRoutes.get('/lots/:id/measurements', read, async (req, res) => {
  const { format } = parse(ExportFormatQuery, req.query)
  await send(res, await lotMeasurementsExport(parse(IdParam, req.params.id)), format)
})
