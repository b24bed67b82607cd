import { IdParam } from '../../shared/schemas/common'
import { AcknowledgeAlertsInput, AlertQuery } from '../../shared/schemas/alerts'
import { PERMISSIONS } from '../../shared/permissions'
import { actorOf } from '../middleware/access'
import { parse } from '../middleware/validate'
import { acknowledgeAlert, acknowledgeAlerts, listAlerts } from '../services/quality'
import { queryHandler } from './handlers'
import { apiRoutes } from './registry'

export const alertRoutes = apiRoutes('/alerts')

alertRoutes.get('/', PERMISSIONS.readAlerts, queryHandler(AlertQuery, listAlerts))
alertRoutes.post('/acknowledge', PERMISSIONS.acknowledgeAlerts, async (req, res) => {
  res.json(await acknowledgeAlerts(parse(AcknowledgeAlertsInput, req.body), actorOf(req)))
})
alertRoutes.post('/:id/acknowledge', PERMISSIONS.acknowledgeAlerts, async (req, res) => {
  res.json(await acknowledgeAlert(parse(IdParam, req.params.id), actorOf(req)))
})
