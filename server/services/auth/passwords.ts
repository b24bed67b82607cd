import bcrypt from 'bcryptjs'

/** bcrypt cost; 12 costs about a quarter of a second here, which slows guessing and not people. */
export const BCRYPT_COST = 12

/** Hashes a password for storage; `cost` below BCRYPT_COST only for a published demo password. */
export function hashPassword(password: string, cost = BCRYPT_COST): Promise<string> {
  return bcrypt.hash(password, cost)
}

// A hash of a random string, compared against when the e-mail is unknown so that a wrong e-mail
// takes as long as a wrong password and the response time does not reveal which accounts exist.
const decoyHash = bcrypt.hashSync(`decoy-${Math.random()}`, BCRYPT_COST)

/** Compares a password with a stored hash; with no hash it spends the same time and fails. */
export async function verifyPassword(password: string, hash: string | null): Promise<boolean> {
  const ok = await bcrypt.compare(password, hash ?? decoyHash)
  return hash !== null && ok
}
