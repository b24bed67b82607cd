import type { Role } from '../../shared/roles'

/** The demo password; demo data only, listed in the README as such. */
export const DEMO_PASSWORD = 'waymark-demo'

/**
 * The bcrypt cost of the demo accounts' hashes. Their password is published in the README, so a
 * slow hash protects nothing; at the full cost every hipot countersign of the demo's past (one
 * bcrypt check each, about a second on a busy 2-core machine) would make the seed take minutes.
 * Accounts made through the Users screen keep BCRYPT_COST.
 */
export const DEMO_HASH_COST = 8

/** The demo people at the invented shop of DESIGN.md §10: one per role, a second operator. */
export const DEMO_USERS: readonly { email: string; name: string; role: Role }[] = [
  { email: 'admin@ferncastle.example', name: 'Rowan Hale', role: 'admin' },
  { email: 'engineer@ferncastle.example', name: 'Imogen Tarrant', role: 'engineer' },
  { email: 'lead@ferncastle.example', name: 'Dev Okafor', role: 'lead' },
  { email: 'operator@ferncastle.example', name: 'Sina Marsh', role: 'operator' },
  { email: 'operator.late@ferncastle.example', name: 'Tobin Ashgrove', role: 'operator' },
  { email: 'stores@ferncastle.example', name: 'Lew Brannock', role: 'stores' },
  { email: 'service@ferncastle.example', name: 'Priya Venn', role: 'service' },
]
