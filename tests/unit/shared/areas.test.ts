import { describe, expect, it } from 'vitest'
import { AREAS, areasForRole } from '../../../shared/areas'
import { ROLES } from '../../../shared/roles'

describe('areasForRole', () => {
  it('shows the admin every area built so far, except the bench import', () => {
    // Bench import records step runs as the person importing, which admins never do.
    const forAdmin = AREAS.filter((a) => a.key !== 'import').map((a) => a.key)
    expect(areasForRole('admin').map((a) => a.key)).toEqual(forAdmin)
    expect(areasForRole('lead').map((a) => a.key)).toContain('import')
    expect(areasForRole('engineer').map((a) => a.key)).toContain('import')
  })

  it('hides the Users and Audit screens from every other role', () => {
    for (const role of ROLES.filter((r) => r !== 'admin')) {
      const keys = areasForRole(role).map((a) => a.key)
      expect(keys).not.toContain('users')
      expect(keys).not.toContain('audit')
    }
  })

  it('gives every area a unique path', () => {
    expect(new Set(AREAS.map((a) => a.path)).size).toBe(AREAS.length)
  })
})
