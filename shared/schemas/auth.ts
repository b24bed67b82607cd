import { z } from 'zod'
import { ROLES } from '../roles'

export const LoginInput = z.object({
  email: z.string().trim().toLowerCase().email('enter a valid e-mail address').max(254),
  password: z.string().min(1, 'enter your password').max(200),
})
export type LoginInput = z.infer<typeof LoginInput>

export const UserDto = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: z.enum(ROLES),
})
export type UserDto = z.infer<typeof UserDto>
