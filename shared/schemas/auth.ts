import { z } from 'zod'
import { text } from './common'
import { ROLES } from '../roles'

export const LoginInput = z.object({
  email: text().trim().toLowerCase().email('enter a valid e-mail address').max(254),
  password: text().min(1, 'enter your password').max(200),
})
export type LoginInput = z.infer<typeof LoginInput>

export const UserDto = z.object({
  id: text(),
  email: text(),
  name: text(),
  role: z.enum(ROLES),
})
export type UserDto = z.infer<typeof UserDto>
