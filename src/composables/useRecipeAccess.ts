import { usePermissionFlags } from './usePermissionFlags'

/** What the signed-in user may do in Recipes and Receiving; it only hides controls. */
export function useRecipeAccess() {
  return usePermissionFlags({
    canEditRecipes: 'editRecipes',
    canEditDefectCodes: 'editDefectCodes',
    canEditParts: 'editParts',
    canReadParts: 'readParts',
    canEditComponentLots: 'editComponentLots',
    canSetLotStatus: 'setComponentLotStatus',
    canPrintLabels: 'printLotLabels',
    // Drafts are the engineers' work in progress; those who may see what stops a release see
    // drafts too. Operators and service read released revisions only.
    canReadDrafts: 'readDraftRecipes',
  })
}
