import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it } from 'vitest'
import type { UserDto } from '@shared/schemas/auth'
import { useLotAccess } from '@/composables/useLotAccess'
import { usePermissionFlags } from '@/composables/usePermissionFlags'
import { useRecipeAccess } from '@/composables/useRecipeAccess'
import { useSessionStore } from '@/stores/session'

const signIn = (role: UserDto['role'] | null) => {
  useSessionStore().user = role ? { id: 'u1', email: 'pat@example.test', name: 'Pat', role } : null
}

describe('usePermissionFlags', () => {
  beforeEach(() => setActivePinia(createPinia()))

  // Expected values read from the lists in shared/permissions.ts.
  it('gives each flag from its permission for the signed-in role, and follows a change', () => {
    signIn('lead')
    const flags = usePermissionFlags({ canEditLots: 'editLots', canEditParts: 'editParts' })
    expect([flags.canEditLots.value, flags.canEditParts.value]).toEqual([true, false])
    signIn('stores')
    expect([flags.canEditLots.value, flags.canEditParts.value]).toEqual([false, true])
  })

  it('gives nobody signed in no flag', () => {
    signIn(null)
    const lots = useLotAccess()
    expect(lots.canRecordStepRuns.value).toBe(false)
    expect(lots.isEngineer.value).toBe(false)
  })

  it('builds the lot and recipe flags, engineer included', () => {
    signIn('engineer')
    const lots = useLotAccess()
    const recipes = useRecipeAccess()
    expect(lots.canEditLots.value).toBe(false)
    expect(lots.canDispose.value).toBe(true)
    expect(lots.isEngineer.value).toBe(true)
    expect(recipes.canEditDefectCodes.value).toBe(true)
    expect(recipes.canReadDrafts.value).toBe(true)
  })
})
