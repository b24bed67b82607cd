import { IdParam } from '../../shared/schemas/common'
import { UserCreateInput, UserUpdateInput } from '../../shared/schemas/users'
import { actorOf } from '../middleware/access'
import { parse } from '../middleware/validate'
import { createUser, listUsers, updateUser } from '../services/admin'
import { apiRoutes } from './registry'

export const userRoutes = apiRoutes('/users')

userRoutes.get('/', ['admin'], async (_req, res) => {
  res.json(await listUsers())
})

userRoutes.post('/', ['admin'], async (req, res) => {
  res.status(201).json(await createUser(parse(UserCreateInput, req.body), actorOf(req)))
})

userRoutes.patch('/:id', ['admin'], async (req, res) => {
  const input = parse(UserUpdateInput, req.body)
  res.json(await updateUser(parse(IdParam, req.params.id), input, actorOf(req)))
})
