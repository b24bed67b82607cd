import type { LoginInput, UserDto } from '../../../shared/schemas/auth'
import { User } from '../../models'
import { recordAudit } from '../audit'
import type { Actor } from '../audit'
import { verifyPassword } from './passwords'

/** The public shape of a user (never the hash). */
export function toUserDto(user: Pick<User, 'id' | 'email' | 'name' | 'role'>): UserDto {
  return { id: user.id, email: user.email, name: user.name, role: user.role }
}

/**
 * Checks an e-mail and password. Returns the user, or null with one reason for the audit log; the
 * caller answers the same 401 for every reason so that the response does not reveal accounts.
 */
export async function authenticate(
  input: LoginInput,
  from: Omit<Actor, 'id' | 'email'>,
): Promise<UserDto | null> {
  const user = await User.findOne({ where: { email: input.email } })
  const isPasswordRight = await verifyPassword(input.password, user?.passwordHash ?? null)
  const reason = !user
    ? 'unknown_email'
    : !isPasswordRight
      ? 'wrong_password'
      : !user.isActive
        ? 'inactive'
        : null
  if (reason || !user) {
    await recordAudit(
      { ...from, id: user?.id ?? null, email: input.email },
      {
        action: 'auth.sign_in_failed',
        entity: 'user',
        entityId: user?.id ?? null,
        after: { reason },
      },
    )
    return null
  }
  user.lastSignInAt = new Date()
  await user.save()
  await recordAudit(
    { ...from, id: user.id, email: user.email },
    { action: 'auth.sign_in', entity: 'user', entityId: user.id },
  )
  return toUserDto(user)
}

/** Records a sign-out. */
export async function recordSignOut(actor: Actor): Promise<void> {
  await recordAudit(actor, { action: 'auth.sign_out', entity: 'user', entityId: actor.id })
}
