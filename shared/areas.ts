import { ROLES } from './roles'
import type { Role } from './roles'

/** The product areas of DESIGN.md §2, each with the roles that may open it. */
export interface AreaDefinition {
  key: AreaKey
  label: string
  path: string
  roles: readonly Role[]
}

/**
 * Areas that exist in this build. An area is listed here only once its screen works, so the
 * navigation never shows a dead link; later issues append to this list.
 */
const AREA_PLACES = [
  { key: 'status', label: 'Status', path: '/admin/status' },
  { key: 'floor', label: 'Floor', path: '/floor' },
  { key: 'lots', label: 'Lots', path: '/lots' },
  { key: 'yield', label: 'Yield', path: '/yield' },
  { key: 'trace', label: 'Trace', path: '/trace' },
  { key: 'shipping', label: 'Shipping', path: '/shipping' },
  { key: 'service', label: 'Service', path: '/service' },
  { key: 'customers', label: 'Customers', path: '/customers' },
  { key: 'recipes', label: 'Recipes', path: '/recipes' },
  { key: 'receiving', label: 'Receiving', path: '/receiving' },
  { key: 'import', label: 'Bench import', path: '/import' },
  { key: 'stations', label: 'Stations', path: '/admin/stations' },
  { key: 'outbox', label: 'Outbox', path: '/outbox' },
  { key: 'users', label: 'Users', path: '/admin/users' },
  { key: 'audit', label: 'Audit log', path: '/admin/audit' },
] as const

export type AreaKey = (typeof AREA_PLACES)[number]['key']

/**
 * Which areas each role may open, in the order of that role's work: the first is where the
 * role lands after signing in (its home). This table is the only place access to a screen is
 * written; the router's guard and the navigation both read it through `AREAS`.
 */
export const ROLE_AREAS: Readonly<Record<Role, readonly AreaKey[]>> = {
  // At a bench: pick the station, then scan.
  operator: ['floor'],
  // Watches the figures, releases lots, disposes failures on the floor, then follows the
  // units out of the door.
  lead: [
    'yield',
    'lots',
    'floor',
    'import',
    'receiving',
    'trace',
    'shipping',
    'customers',
    'service',
    'recipes',
    'stations',
  ],
  // Writes and releases recipes, then sees how they build.
  engineer: [
    'recipes',
    'yield',
    'lots',
    'floor',
    'import',
    'trace',
    'receiving',
    'service',
    'shipping',
    'customers',
    'stations',
  ],
  // Goods-in.
  stores: ['receiving'],
  // Answers customers: what went into a unit, returns, shipments, certificates sent.
  service: ['trace', 'service', 'shipping', 'customers', 'outbox', 'lots', 'receiving'],
  // Keeps the system running first; reads everything else.
  admin: [
    'status',
    'users',
    'stations',
    'outbox',
    'audit',
    'floor',
    'lots',
    'yield',
    'trace',
    'shipping',
    'service',
    'customers',
    'recipes',
    'receiving',
  ],
}

/** Every area with the roles that may open it (derived from `ROLE_AREAS`). */
export const AREAS: readonly AreaDefinition[] = AREA_PLACES.map((place) => ({
  ...place,
  roles: ROLES.filter((role) => ROLE_AREAS[role].includes(place.key)),
}))

const byKey = new Map(AREAS.map((a) => [a.key, a]))

/** The area with this key. */
export function areaOf(key: AreaKey): AreaDefinition {
  return byKey.get(key)!
}

/** Areas the given role may open, in the order of the role's work (navigation order). */
export function areasForRole(role: Role): AreaDefinition[] {
  return ROLE_AREAS[role].map(areaOf)
}

/** Where the role lands after signing in: the first area of its work. */
export function homeAreaOf(role: Role): AreaDefinition {
  return areaOf(ROLE_AREAS[role][0]!)
}
