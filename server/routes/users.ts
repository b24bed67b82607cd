import { IdParam } from '../../shared/schemas/common'
import { UserCreateInput, UserUpdateInput } from '../../shared/schemas/users'
import { actorOf } from '../middleware/access'
import { parse } from '../middleware/validate'
import { createUser, issueBadge, listUsers, updateUser } from '../services/admin'
import { createHandler } from './handlers'
import { apiRoutes } from './registry'

export const userRoutes = apiRoutes('/users')

userRoutes.get('/', ['admin'], async (_req, res) => {
  res.json(await listUsers())
})

userRoutes.post('/', ['admin'], createHandler(UserCreateInput, createUser))

userRoutes.patch('/:id', ['admin'], async (req, res) => {
  const input = parse(UserUpdateInput, req.body)
  res.json(await updateUser(parse(IdParam, req.params.id), input, actorOf(req)))
})

/** Prints a person's badge (a new code each time: the card printed before stops signing). */
userRoutes.post('/:id/badge', ['admin'], async (req, res) => {
  const pdf = await issueBadge(parse(IdParam, req.params.id), actorOf(req))
  res.setHeader('Content-Disposition', 'attachment; filename="badge.pdf"')
  res.type('application/pdf').send(pdf)
})
