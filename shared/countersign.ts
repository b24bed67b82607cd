import type { Role } from './roles'

/** The second person as read for a countersign: the user the e-mail names, if any. */
export interface Countersigner {
  id: string
  email: string
  role: Role
  isActive: boolean
}

/**
 * What was read of a countersign: who the e-mail (or the scanned badge) names and whether the
 * password (or the PIN) fits.
 */
export interface CountersignRead {
  /** The e-mail typed, or the badge code scanned. */
  email: string
  user: Countersigner | null
  isPasswordRight: boolean
  /** How the person signed: a badge and PIN, or (when left out) an e-mail and password. */
  by?: 'badge' | 'password'
}

/** Why a countersign does not count, naming the `countersign` field. */
export interface CountersignRefusal {
  /**
   * The API error code: `countersign_rejected` for a wrong e-mail or password, which the
   * password limits count (server/middleware/rateLimits.ts); `validation_failed` otherwise.
   */
  code: 'countersign_rejected' | 'validation_failed'
  message: string
  field: string
  /** A wrong e-mail or password: audited like a failed sign-in. */
  isWrongCredentials: boolean
}

/**
 * The rules of a second person's signature: one must be typed, the e-mail and password must be
 * an active user's (or the badge and PIN), someone other than the actor, holding one of `roles`; null when it counts.
 * A wrong e-mail and a wrong password get the same words, as at sign-in.
 * @param what the thing signed, for the operator's message (a step's name, "use as is")
 */
export function countersignRefusal(
  read: CountersignRead | null,
  actorId: string | null,
  roles: readonly Role[],
  what: string,
): CountersignRefusal | null {
  if (!read)
    return {
      code: 'validation_failed',
      message: `countersign: ${what} needs a second person to sign`,
      field: 'a second person must sign',
      isWrongCredentials: false,
    }
  const { user } = read
  if (!user || !read.isPasswordRight || !user.isActive) {
    const pair = read.by === 'badge' ? 'badge or PIN' : 'e-mail or password'
    return {
      code: 'countersign_rejected',
      message: `countersign: the second person’s ${pair} is wrong`,
      field: `${pair} is wrong`,
      isWrongCredentials: true,
    }
  }
  if (user.id === actorId)
    return {
      code: 'validation_failed',
      message: 'countersign: the second person must be someone else',
      field: 'must be someone else',
      isWrongCredentials: false,
    }
  if (!roles.includes(user.role))
    return {
      code: 'validation_failed',
      message: `countersign: ${what} must be signed by ${roles.join(' or ')}`,
      field: `needs ${roles.join(' or ')}`,
      isWrongCredentials: false,
    }
  return null
}
