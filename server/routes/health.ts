import { checkHealth } from '../services/admin'
import { apiRoutes } from './registry'

export const healthRoutes = apiRoutes('/health')

// Public so a load balancer can probe it; it reveals only up/down per part and the version.
healthRoutes.get('/', 'public', async (_req, res) => {
  const health = await checkHealth()
  res.status(health.status === 'ok' ? 200 : 503).json(health)
})
