import { describe, expect, it } from 'vitest'
import { AREAS, ROLE_AREAS, areasForRole, homeAreaOf } from '../../../shared/areas'
import { PERMISSIONS } from '../../../shared/permissions'
import type { Permission } from '../../../shared/permissions'
import { ROLES } from '../../../shared/roles'
import type { AreaKey } from '../../../shared/areas'

describe('areasForRole', () => {
  it('lands each role on the home its work starts at', () => {
    // Issue 19: operator at the Floor, lead at the Yield board, engineer at Recipes, stores at
    // Receiving, service at Trace, admin at the status page.
    expect(Object.fromEntries(ROLES.map((r) => [r, homeAreaOf(r).path]))).toEqual({
      operator: '/floor',
      lead: '/yield',
      engineer: '/recipes',
      stores: '/receiving',
      service: '/trace',
      admin: '/admin/status',
    })
  })

  it('orders the navigation by the role, its home first', () => {
    expect(areasForRole('lead').map((a) => a.key)).toEqual(ROLE_AREAS.lead)
    expect(areasForRole('service').map((a) => a.label)).toEqual([
      'Trace',
      'Service',
      'Shipping',
      'Customers',
      'Outbox',
      'Lots',
      'Receiving',
    ])
    for (const role of ROLES) expect(areasForRole(role)[0]).toEqual(homeAreaOf(role))
  })

  it('shows the admin every area but the bench import, and the status page to nobody else', () => {
    // Bench import records step runs as the person importing, which admins never do.
    const forAdmin = AREAS.filter((a) => a.key !== 'import').map((a) => a.key)
    expect([...areasForRole('admin').map((a) => a.key)].sort()).toEqual([...forAdmin].sort())
    for (const role of ROLES.filter((r) => r !== 'admin')) {
      const keys = areasForRole(role).map((a) => a.key)
      expect(keys).not.toContain('users')
      expect(keys).not.toContain('audit')
      expect(keys).not.toContain('status')
    }
  })

  it('lists no area twice for a role, and gives every area a role and a unique path', () => {
    for (const role of ROLES) expect(new Set(ROLE_AREAS[role]).size).toBe(ROLE_AREAS[role].length)
    for (const area of AREAS) expect(area.roles.length).toBeGreaterThan(0)
    expect(new Set(AREAS.map((a) => a.path)).size).toBe(AREAS.length)
  })

  it('opens an area to exactly the roles the API lets read it', () => {
    // A screen shown to a role the server refuses would be a page of errors; one hidden from a
    // role the server serves would be a feature nobody finds.
    const readBy: Partial<Record<AreaKey, Permission>> = {
      floor: 'useFloor',
      lots: 'readLots',
      yield: 'readYield',
      trace: 'traceUnits',
      shipping: 'readShipments',
      service: 'readServiceCases',
      customers: 'readCustomers',
      receiving: 'readComponentLots',
      import: 'importBenchData',
      outbox: 'readOutbox',
      recipes: 'readDraftRecipes',
    }
    for (const [key, permission] of Object.entries(readBy)) {
      const area = AREAS.find((a) => a.key === key)!
      expect([...area.roles].sort(), key).toEqual([...PERMISSIONS[permission]].sort())
    }
  })
})
