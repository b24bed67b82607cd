import type { UserAdminDto, UserCreateInput, UserUpdateInput } from '../../../shared/schemas/users'
import { AppError } from '../../errors'
import { User } from '../../models'
import { auditAction, auditCreated, changedFields, conflictOnDuplicate, findOr404 } from '../audit'
import type { Actor } from '../audit'
import { forgetUsers, hashPassword, toUserDto } from '../auth'
import { execute, withTransaction } from '../../db/sql'

function toAdminDto(user: User): UserAdminDto {
  return {
    ...toUserDto(user),
    isActive: user.isActive,
    lastSignInAt: user.lastSignInAt?.toISOString() ?? null,
    createdAt: user.createdAt.toISOString(),
    hasBadge: user.badgeCode !== null,
    hasPin: user.pinHash !== null,
  }
}

/** Every user, for the Admin screen, active ones first. */
export async function listUsers(): Promise<UserAdminDto[]> {
  const users = await User.findAll({
    order: [
      ['isActive', 'DESC'],
      ['name', 'ASC'],
    ],
  })
  return users.map(toAdminDto)
}

/** Creates a user; a taken e-mail is a 409 naming the field. */
export async function createUser(input: UserCreateInput, actor: Actor): Promise<UserAdminDto> {
  const passwordHash = await hashPassword(input.password)
  return withTransaction(async (transaction) => {
    const user = await User.create({ ...input, passwordHash, lastSignInAt: null }, { transaction })
    return auditCreated(actor, 'user.create', user.id, toAdminDto(user), transaction)
  }).catch(conflictOnDuplicate('a user with this e-mail exists', { email: 'already in use' }))
}

/**
 * Changes a user's name, role, password or active flag. Deactivating also deletes the user's
 * stored sessions, so a signed-in browser loses access on its next request.
 */
export async function updateUser(
  id: string,
  input: UserUpdateInput,
  actor: Actor,
): Promise<UserAdminDto> {
  if (id === actor.id && (input.isActive === false || (input.role && input.role !== 'admin')))
    throw AppError.conflict(
      'self_lockout',
      'you cannot deactivate yourself or drop your own admin role',
    )
  const { password, ...fields } = input
  const updated = await withTransaction(async (transaction) => {
    const user = await findOr404(User, id, 'user', transaction, true)
    const before = toAdminDto(user)
    user.set(fields)
    if (password) user.passwordHash = await hashPassword(password)
    await user.save({ transaction })
    const after = toAdminDto(user)
    const diff = changedFields(before, after)
    if (password) diff.after.password = 'changed'
    await auditAction(actor, 'user.update', id, diff, transaction)
    if (input.isActive === false || password) await endSessionsOf(id, transaction)
    return after
  })
  // Other processes hear of it from the users trigger; this one must not wait for that.
  forgetUsers()
  return updated
}

/** Deletes every stored session that belongs to the user. */
async function endSessionsOf(userId: string, transaction: import('sequelize').Transaction) {
  await execute(`DELETE FROM sessions WHERE sess -> 'passport' ->> 'user' = :userId`, {
    replacements: { userId },
    transaction,
  })
}
