import { computed } from 'vue'
import type { ComputedRef } from 'vue'
import { can } from '@shared/permissions'
import type { Permission } from '@shared/permissions'
import { useSessionStore } from '@/stores/session'

/**
 * One flag per permission for the signed-in user, from the permission lists the server's route
 * guards read. The flags only hide controls: the server checks every call.
 * @param flags each flag's name and the permission it reads, e.g. `{ canEditLots: 'editLots' }`
 */
export function usePermissionFlags<K extends string>(
  flags: Record<K, Permission>,
): Record<K, ComputedRef<boolean>> {
  const session = useSessionStore()
  const entries = Object.entries(flags) as [K, Permission][]
  return Object.fromEntries(
    entries.map(([name, permission]) => [
      name,
      computed(() => can(session.role ?? undefined, permission)),
    ]),
  ) as Record<K, ComputedRef<boolean>>
}
