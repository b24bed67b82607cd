import { randomBytes } from 'node:crypto'
import { ROLE_LABELS } from '../../../shared/roles'
import { badgePdf } from '../../documents/badge'
import { env } from '../../env'
import { AppError } from '../../errors'
import { User } from '../../models'
import { withTransaction } from '../../db/sql'
import { hashPassword, verifyPassword } from '../auth'
import { auditAction } from '../audit'
import type { Actor } from '../audit'

/** Crockford's base 32: no I, L, O or U, so a badge code read aloud is not misheard. */
const CROCKFORD = '0123456789ABCDEFGHJKMNPQRSTVWXYZ'

/** A new badge code: `BADGE-` and 16 characters from 80 random bits (shared/links BADGE_CODE_SHAPE). */
export function newBadgeCode(): string {
  const bytes = randomBytes(10)
  let bits = 0n
  for (const b of bytes) bits = (bits << 8n) | BigInt(b)
  let code = ''
  for (let i = 0; i < 16; i++) {
    code = CROCKFORD[Number(bits & 31n)]! + code
    bits >>= 5n
  }
  return `BADGE-${code}`
}

async function activeUser(userId: string): Promise<User> {
  const user = await User.findByPk(userId)
  if (!user || !user.isActive) throw AppError.notFound('user')
  return user
}

/**
 * Prints a person's badge: a new code each time, so a lost card stops signing as soon as its
 * replacement is printed. Audited (never the code itself: the log is read by people who should
 * not be able to print someone's badge from it).
 */
export async function issueBadge(userId: string, actor: Actor): Promise<Buffer> {
  const user = await activeUser(userId)
  const badgeCode = newBadgeCode()
  const hadBadge = user.badgeCode !== null
  await withTransaction(async (transaction) => {
    await user.update({ badgeCode }, { transaction })
    const change = {
      before: { badge: hadBadge ? 'printed' : 'none' },
      after: { badge: hadBadge ? 'replaced' : 'printed' },
    }
    await auditAction(actor, 'user.badge', user.id, change, transaction)
  })
  return badgePdf({
    name: user.name,
    role: ROLE_LABELS[user.role],
    badgeCode,
    shopName: env.WAYMARK_SHOP_NAME,
  })
}

/**
 * Sets the signed-in person's bench PIN, after their password is confirmed (a PIN is a second
 * way to sign as them). Hashed like a password; audited without the value.
 */
export async function setOwnPin(
  actor: Actor,
  input: { password: string; pin: string },
): Promise<{ pinSetAt: string }> {
  if (!actor.id) throw AppError.forbidden()
  const user = await activeUser(actor.id)
  if (!(await verifyPassword(input.password, user.passwordHash)))
    throw new AppError(400, 'password_rejected', 'password: your password is wrong', {
      password: 'is wrong',
    })
  const pinHash = await hashPassword(input.pin)
  const pinSetAt = new Date()
  await withTransaction(async (transaction) => {
    const hadPin = user.pinHash !== null
    await user.update({ pinHash, pinSetAt }, { transaction })
    const change = {
      before: { pin: hadPin ? 'set' : 'none' },
      after: { pin: hadPin ? 'changed' : 'set' },
    }
    await auditAction(actor, 'user.pin', user.id, change, transaction)
  })
  return { pinSetAt: pinSetAt.toISOString() }
}
