import { SearchQuery } from '../../shared/schemas/search'
import { signedInUser } from '../middleware/access'
import { parse } from '../middleware/validate'
import { searchRecords } from '../services/search'
import { apiRoutes } from './registry'

export const searchRoutes = apiRoutes('/search')

// Open to everyone signed in; the service lists only the kinds of record the role may read.
searchRoutes.get('/', 'signed_in', async (req, res) => {
  const { q } = parse(SearchQuery, req.query)
  res.json(await searchRecords(q, signedInUser(req).role))
})
