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
    key: 'stations',
    label: 'Stations',
    path: '/admin/stations',
    roles: ['admin', 'lead', 'engineer'],
  },
  { key: 'users', label: 'Users', path: '/admin/users', roles: ['admin'] },
  { key: 'audit', label: 'Audit log', path: '/admin/audit', roles: ['admin'] },
]

/** Areas the given role may open, in navigation order. */
export function areasForRole(role: Role): AreaDefinition[] {
  return AREAS.filter((a) => a.roles.includes(role))
}
