import { CustomerCreateInput, CustomerUpdateInput } from '../../shared/schemas/shipping'
import { PERMISSIONS } from '../../shared/permissions'
import { createCustomer, getCustomer, listCustomers, updateCustomer } from '../services/shipping'
import { changeHandler, createHandler, readHandler } from './handlers'
import { apiRoutes } from './registry'

export const customerRoutes = apiRoutes('/customers')

customerRoutes.get('/', PERMISSIONS.readCustomers, async (_req, res) => {
  res.json(await listCustomers())
})
customerRoutes.post(
  '/',
  PERMISSIONS.editCustomers,
  createHandler(CustomerCreateInput, createCustomer),
)
customerRoutes.get('/:id', PERMISSIONS.readCustomers, readHandler(getCustomer))
customerRoutes.patch(
  '/:id',
  PERMISSIONS.editCustomers,
  changeHandler(CustomerUpdateInput, updateCustomer),
)
