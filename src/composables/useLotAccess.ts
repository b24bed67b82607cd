import { computed } from 'vue'
import { useSessionStore } from '@/stores/session'
import { usePermissionFlags } from './usePermissionFlags'

/** What the signed-in user may do in Lots and on the Floor; it only hides controls. */
export function useLotAccess() {
  const session = useSessionStore()
  const flags = usePermissionFlags({
    canEditLots: 'editLots',
    canDispose: 'disposeNonconformances',
    canRecordStepRuns: 'recordStepRuns',
    canReadAlerts: 'readAlerts',
  })
  /** Use as is by anyone else needs an engineer's countersign. */
  const isEngineer = computed(() => session.role === 'engineer')
  return { ...flags, isEngineer }
}
