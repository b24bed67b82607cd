import { readSystemStatus } from '../services/status'
import { apiRoutes } from './registry'

export const statusRoutes = apiRoutes('/status')

// The admin's home: the services, the job queues, failed e-mails and who signs in. Unlike the
// public /api/health it names queue sizes and users, so it is for admins only.
statusRoutes.get('/', ['admin'], async (_req, res) => {
  res.json(await readSystemStatus())
})
