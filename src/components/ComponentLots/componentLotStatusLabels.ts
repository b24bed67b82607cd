import type { ComponentLotStatus } from '@shared/recipeDefinitions'

/** Human labels for component lot statuses. */
export const COMPONENT_LOT_STATUS_LABELS: Record<ComponentLotStatus, string> = {
  available: 'Available',
  quarantined: 'Quarantined',
  used_up: 'Used up',
  rejected: 'Rejected',
}
