import { IdParam } from '../../shared/schemas/common'
import { CustomerCreateInput, CustomerUpdateInput } from '../../shared/schemas/shipping'
import { PERMISSIONS } from '../../shared/permissions'
import { actorOf } from '../middleware/access'
import { parse } from '../middleware/validate'
import { createCustomer, getCustomer, listCustomers, updateCustomer } from '../services/shipping'
import { apiRoutes } from './registry'

export const customerRoutes = apiRoutes('/customers')

customerRoutes.get('/', PERMISSIONS.readCustomers, async (_req, res) => {
  res.json(await listCustomers())
})
customerRoutes.post('/', PERMISSIONS.editCustomers, async (req, res) => {
  res.status(201).json(await createCustomer(parse(CustomerCreateInput, req.body), actorOf(req)))
})
customerRoutes.get('/:id', PERMISSIONS.readCustomers, async (req, res) => {
  res.json(await getCustomer(parse(IdParam, req.params.id)))
})
customerRoutes.patch('/:id', PERMISSIONS.editCustomers, async (req, res) => {
  res.json(
    await updateCustomer(
      parse(IdParam, req.params.id),
      parse(CustomerUpdateInput, req.body),
      actorOf(req),
    ),
  )
})
