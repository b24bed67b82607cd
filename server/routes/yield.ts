import { IdParam } from '../../shared/schemas/common'
import { YieldSummaryQuery } from '../../shared/schemas/yield'
import { LotStatisticsQuery, ProductStatisticsQuery } from '../../shared/schemas/statistics'
import { PERMISSIONS } from '../../shared/permissions'
import { parse } from '../middleware/validate'
import { lotTurnDeviation } from '../services/quality'
import { getLotYield, summarizeYield } from '../services/quality'
import { getLotYieldDetail } from '../services/quality'
import { lotStatistics, productStatistics } from '../services/quality'
import { apiRoutes } from './registry'

export const yieldRoutes = apiRoutes('/yield')
const read = PERMISSIONS.readYield

yieldRoutes.get('/summary', read, async (req, res) => {
  res.json(await summarizeYield(parse(YieldSummaryQuery, req.query)))
})
yieldRoutes.get('/lots/:id', read, async (req, res) => {
  res.json(await getLotYield(parse(IdParam, req.params.id)))
})
yieldRoutes.get('/lots/:id/detail', read, async (req, res) => {
  res.json(await getLotYieldDetail(parse(IdParam, req.params.id)))
})
yieldRoutes.get('/lots/:id/turns', read, async (req, res) => {
  res.json(await lotTurnDeviation(parse(IdParam, req.params.id)))
})
yieldRoutes.get('/lots/:id/statistics', read, async (req, res) => {
  res.json(await lotStatistics(parse(IdParam, req.params.id), parse(LotStatisticsQuery, req.query)))
})
yieldRoutes.get('/statistics', read, async (req, res) => {
  res.json(await productStatistics(parse(ProductStatisticsQuery, req.query)))
})
