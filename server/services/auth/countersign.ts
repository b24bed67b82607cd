import type { Transaction } from 'sequelize'
import { countersignRefusal } from '../../../shared/countersign'
import type { CountersignRead } from '../../../shared/countersign'
import type { Role } from '../../../shared/roles'
import type { CountersignInput } from '../../../shared/schemas/lots'
import { AppError } from '../../errors'
import { User } from '../../models'
import { recordAudit } from '../audit'
import type { Actor } from '../audit'
import { verifyPassword } from './passwords'

async function lookUp(
  input: CountersignInput,
  transaction: Transaction,
): Promise<{ read: CountersignRead; user: User | null }> {
  const byBadge = 'badge' in input
  const user = byBadge
    ? await User.findOne({ where: { badgeCode: input.badge }, transaction })
    : await User.findOne({ where: { email: input.email }, transaction })
  // A person without a PIN cannot sign by badge; the check still costs a hash's time.
  const isPasswordRight = byBadge
    ? await verifyPassword(input.pin, user?.pinHash ?? null)
    : await verifyPassword(input.password, user?.passwordHash ?? null)
  const signer = user
    ? { id: user.id, email: user.email, role: user.role, isActive: user.isActive }
    : null
  const read: CountersignRead = {
    email: byBadge ? input.badge : input.email,
    user: signer,
    isPasswordRight,
    by: byBadge ? 'badge' : 'password',
  }
  return { read, user }
}

/**
 * Reads a typed countersign: the user its e-mail names and whether the password fits. Decides
 * nothing (shared/countersign.ts does); null when none was typed.
 */
export async function readCountersign(
  input: CountersignInput | null,
  transaction: Transaction,
): Promise<CountersignRead | null> {
  return input ? (await lookUp(input, transaction)).read : null
}

/**
 * Audits a countersign with a wrong e-mail or password, like a failed sign-in. Outside the
 * caller's transaction on purpose: the refusal rolls that back, and the attempt must stay.
 */
export async function auditCountersignFailure(
  read: CountersignRead,
  actor: Actor,
  what: string,
): Promise<void> {
  // The actor is the person signed in at the bench; the account tried is named beside it.
  const badge = read.by === 'badge'
  const reason = !read.user
    ? badge
      ? 'unknown_badge'
      : 'unknown_email'
    : !read.isPasswordRight
      ? badge
        ? 'wrong_pin'
        : 'wrong_password'
      : 'inactive'
  await recordAudit(actor, {
    action: 'countersign.failed',
    entity: 'user',
    entityId: read.user?.id ?? null,
    after: badge
      ? { what, triedBadge: read.email, reason }
      : { what, triedEmail: read.email, reason },
  })
}

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
  const found = input ? await lookUp(input, transaction) : null
  const refusal = countersignRefusal(found?.read ?? null, actor.id, roles, what)
  if (refusal) {
    if (found && refusal.isWrongCredentials) await auditCountersignFailure(found.read, actor, what)
    throw new AppError(400, refusal.code, refusal.message, { countersign: refusal.field })
  }
  return found!.user!
}
