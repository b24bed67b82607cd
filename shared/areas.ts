import { PERMISSIONS } from './permissions'
import type { Role } from './roles'

/** The product areas of DESIGN.md §2, each with the roles that may open it. */
export interface AreaDefinition {
  key: string
  label: string
  path: string
  roles: readonly Role[]
}

/**
 * Areas that exist in this build. An area is listed here only once its screen works, so the
 * navigation never shows a dead link; later issues append to this list.
 */
export const AREAS: readonly AreaDefinition[] = [
  {
    key: 'floor',
    label: 'Floor',
    path: '/floor',
    roles: ['operator', 'lead', 'engineer', 'admin'],
  },
  { key: 'lots', label: 'Lots', path: '/lots', roles: ['lead', 'engineer', 'admin', 'service'] },
  { key: 'yield', label: 'Yield', path: '/yield', roles: PERMISSIONS.readYield },
  { key: 'trace', label: 'Trace', path: '/trace', roles: ['service', 'lead', 'engineer', 'admin'] },
  {
    key: 'shipping',
    label: 'Shipping',
    path: '/shipping',
    roles: ['lead', 'service', 'admin', 'engineer'],
  },
  {
    key: 'service',
    label: 'Service',
    path: '/service',
    roles: ['service', 'lead', 'engineer', 'admin'],
  },
  {
    key: 'customers',
    label: 'Customers',
    path: '/customers',
    roles: ['lead', 'service', 'admin', 'engineer'],
  },
  { key: 'recipes', label: 'Recipes', path: '/recipes', roles: ['engineer', 'lead', 'admin'] },
  {
    key: 'receiving',
    label: 'Receiving',
    path: '/receiving',
    roles: ['stores', 'lead', 'admin', 'engineer', 'service'],
  },
  { key: 'import', label: 'Bench import', path: '/import', roles: ['lead', 'engineer'] },
  {
    key: 'stations',
    label: 'Stations',
    path: '/admin/stations',
    roles: ['admin', 'lead', 'engineer'],
  },
  { key: 'outbox', label: 'Outbox', path: '/outbox', roles: ['admin', 'service'] },
  { key: 'users', label: 'Users', path: '/admin/users', roles: ['admin'] },
  { key: 'audit', label: 'Audit log', path: '/admin/audit', roles: ['admin'] },
]

/** Areas the given role may open, in navigation order. */
export function areasForRole(role: Role): AreaDefinition[] {
  return AREAS.filter((a) => a.roles.includes(role))
}
