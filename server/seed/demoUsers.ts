import type { Role } from '../../shared/roles'

/** The demo password; demo data only, listed in the README as such. */
export const DEMO_PASSWORD = 'waymark-demo'

/** One demo person per role at the invented shop of DESIGN.md §10. */
export const DEMO_USERS: readonly { email: string; name: string; role: Role }[] = [
  { email: 'admin@ferncastle.example', name: 'Rowan Hale', role: 'admin' },
  { email: 'engineer@ferncastle.example', name: 'Imogen Tarrant', role: 'engineer' },
  { email: 'lead@ferncastle.example', name: 'Dev Okafor', role: 'lead' },
  { email: 'operator@ferncastle.example', name: 'Sina Marsh', role: 'operator' },
  { email: 'stores@ferncastle.example', name: 'Lew Brannock', role: 'stores' },
  { email: 'service@ferncastle.example', name: 'Priya Venn', role: 'service' },
]
