import type { Transaction } from 'sequelize'
import type { Role } from '../../shared/roles'
import type { CountersignInput } from '../../shared/schemas/lots'
import { AppError } from '../errors'
import { User } from '../models'
import { recordAudit } from './audit'
import type { Actor } from './audit'
import { verifyPassword } from './passwords'

/**
 * Checks a second person's e-mail and password, typed at the bench to countersign. The second
 * person must be another active user holding one of `roles`. A wrong e-mail or password is
 * audited (who tried, which account, from where) and answered with one text naming the
 * `countersign` field; the route's `countersignLimiters()` slow down guessing.
 */
export async function verifyCountersign(
  input: CountersignInput | null,
  actor: Actor,
  roles: readonly Role[],
  what: string,
  transaction: Transaction,
): Promise<User> {
  if (!input)
    throw AppError.badRequest(`countersign: ${what} needs a second person to sign`, {
      countersign: 'a second person must sign',
    })
  const user = await User.findOne({ where: { email: input.email }, transaction })
  const isRight = await verifyPassword(input.password, user?.passwordHash ?? null)
  if (!user || !isRight || !user.isActive) {
    // Outside the transaction, so the row stays when the refusal rolls the change back. The
    // actor is the person signed in at the bench; the account tried is named beside it.
    await recordAudit(actor, {
      action: 'countersign.failed',
      entity: 'user',
      entityId: user?.id ?? null,
      after: {
        what,
        triedEmail: input.email,
        reason: !user ? 'unknown_email' : !isRight ? 'wrong_password' : 'inactive',
      },
    })
    // Its own code, which the password limiters count (middleware/rateLimits.ts).
    throw new AppError(
      400,
      'countersign_rejected',
      'countersign: the second person’s e-mail or password is wrong',
      { countersign: 'e-mail or password is wrong' },
    )
  }
  if (user.id === actor.id)
    throw AppError.badRequest('countersign: the second person must be someone else', {
      countersign: 'must be someone else',
    })
  if (!roles.includes(user.role))
    throw AppError.badRequest(`countersign: ${what} must be signed by ${roles.join(' or ')}`, {
      countersign: `needs ${roles.join(' or ')}`,
    })
  return user
}
