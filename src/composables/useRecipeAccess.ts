import { computed } from 'vue'
import { can } from '@shared/permissions'
import type { Permission } from '@shared/permissions'
import { useSessionStore } from '@/stores/session'

/**
 * What the signed-in user may do in Recipes and Receiving, from the same permission lists the
 * server's route guards read. It only hides controls: the server checks every call.
 */
export function useRecipeAccess() {
  const session = useSessionStore()
  const has = (permission: Permission) => computed(() => can(session.role ?? undefined, permission))
  return {
    canEditRecipes: has('editRecipes'),
    canEditDefectCodes: has('editDefectCodes'),
    canEditParts: has('editParts'),
    canReadParts: has('readParts'),
    canEditComponentLots: has('editComponentLots'),
    canSetLotStatus: has('setComponentLotStatus'),
    canPrintLabels: has('printLotLabels'),
    /**
     * Drafts are the engineers' work in progress; those who may see what stops a release see
     * drafts too. Operators and service read released revisions only.
     */
    canReadDrafts: has('readDraftRecipes'),
  }
}
