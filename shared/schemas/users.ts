import { z } from 'zod'
import { text } from './common'
import { ROLES } from '../roles'

export const PASSWORD_MIN_LENGTH = 10

export const UserCreateInput = z.object({
  email: text().trim().toLowerCase().email('enter a valid e-mail address').max(254),
  name: text().trim().min(1, 'enter a name').max(120),
  role: z.enum(ROLES, { error: 'choose a role' }),
  password: text()
    .min(PASSWORD_MIN_LENGTH, `use at least ${PASSWORD_MIN_LENGTH} characters`)
    .max(200),
})
export type UserCreateInput = z.infer<typeof UserCreateInput>

export const UserUpdateInput = z
  .object({
    name: text().trim().min(1, 'enter a name').max(120),
    role: z.enum(ROLES, { error: 'choose a role' }),
    isActive: z.boolean(),
    password: text()
      .min(PASSWORD_MIN_LENGTH, `use at least ${PASSWORD_MIN_LENGTH} characters`)
      .max(200),
  })
  .partial()
export type UserUpdateInput = z.infer<typeof UserUpdateInput>

/** A user as the Admin screen lists it. */
export interface UserAdminDto {
  id: string
  email: string
  name: string
  role: (typeof ROLES)[number]
  isActive: boolean
  lastSignInAt: string | null
  createdAt: string
  /** Whether a badge has been printed for this person (the code itself is never sent). */
  hasBadge: boolean
  /** Whether the person has set a bench PIN. */
  hasPin: boolean
}

/** A person's bench PIN, set by themselves after re-typing their password. */
export const PinInput = z.object({
  password: text().min(1, 'enter your password').max(200),
  pin: text().regex(/^\d{4,8}$/, 'use 4 to 8 digits'),
})
export type PinInput = z.infer<typeof PinInput>
