import { computed } from 'vue'
import { can } from '@shared/permissions'
import type { Permission } from '@shared/permissions'
import { useSessionStore } from '@/stores/session'

/**
 * What the signed-in user may do in Lots and on the Floor, from the permission lists the
 * server's route guards read. It only hides controls: the server checks every call.
 */
export function useLotAccess() {
  const session = useSessionStore()
  const has = (permission: Permission) => computed(() => can(session.role ?? undefined, permission))
  return {
    canEditLots: has('editLots'),
    canDispose: has('disposeNonconformances'),
    canRecordStepRuns: has('recordStepRuns'),
    canReadAlerts: has('readAlerts'),
    /** Use as is by anyone else needs an engineer's countersign. */
    isEngineer: computed(() => session.role === 'engineer'),
  }
}
