import { IdParam } from '../../shared/schemas/common'
import { ProductCreateInput, ProductUpdateInput } from '../../shared/schemas/recipes'
import { can, PERMISSIONS } from '../../shared/permissions'
import { actorOf, signedInUser } from '../middleware/access'
import { parse } from '../middleware/validate'
import { createProduct, listProducts, updateProduct } from '../services/recipes'
import { createRevision } from '../services/recipes'
import { changeHandler, createHandler } from './handlers'
import { apiRoutes } from './registry'

export const productRoutes = apiRoutes('/products')
const edit = PERMISSIONS.editRecipes

productRoutes.get('/', 'signed_in', async (req, res) => {
  res.json(await listProducts(can(signedInUser(req).role, 'readDraftRecipes')))
})

productRoutes.post('/', edit, createHandler(ProductCreateInput, createProduct))

productRoutes.patch('/:id', edit, changeHandler(ProductUpdateInput, updateProduct))

productRoutes.post('/:id/revisions', edit, async (req, res) => {
  res.status(201).json(await createRevision(parse(IdParam, req.params.id), actorOf(req)))
})
