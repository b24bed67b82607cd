/** Lot states (DESIGN.md §4); a hold is a flag on top of the state, not a state of its own. */
export const LOT_STATUSES = ['planned', 'released', 'in_progress', 'closed'] as const
export type LotStatus = (typeof LOT_STATUSES)[number]

/** Unit states (DESIGN.md §2). */
export const UNIT_STATES = [
  'queued',
  'in_progress',
  'on_hold',
  'in_rework',
  'scrapped',
  'passed',
  'shipped',
  'returned',
] as const
export type UnitState = (typeof UNIT_STATES)[number]

/** States in which a unit is still moving through its route. */
export const OPEN_UNIT_STATES: readonly UnitState[] = ['queued', 'in_progress', 'in_rework']
/** States in which a unit's route has ended. */
export const FINISHED_UNIT_STATES: readonly UnitState[] = [
  'scrapped',
  'passed',
  'shipped',
  'returned',
]
/**
 * Finished states that count as passed; a returned unit passed its route before it left (the
 * return is a field event, not a test result).
 */
export const PASSED_UNIT_STATES: readonly UnitState[] = ['passed', 'shipped', 'returned']

export const UNIT_STATE_LABELS: Record<UnitState, string> = {
  queued: 'Queued',
  in_progress: 'In progress',
  on_hold: 'On hold',
  in_rework: 'In rework',
  scrapped: 'Scrapped',
  passed: 'Passed',
  shipped: 'Shipped',
  returned: 'Returned',
}

export const DISPOSITIONS = ['rework', 'scrap', 'use_as_is'] as const
export type Disposition = (typeof DISPOSITIONS)[number]

/** What a cell of the lot's unit × step grid shows. */
export const GRID_CELLS = [
  'not_reached',
  'passed_first',
  'passed_after_rework',
  'failed',
  'in_progress',
] as const
export type GridCell = (typeof GRID_CELLS)[number]

/**
 * Kinds of generated PDF. Lot documents (travelers, labels, lot report) carry a lot id; a
 * certificate or packing slip carries a shipment id or a unit id; a unit history a unit id.
 */
export const DOCUMENT_KINDS = [
  'travelers',
  'labels',
  'lot_report',
  'certificate',
  'packing_slip',
  'unit_history',
] as const
export type DocumentKind = (typeof DOCUMENT_KINDS)[number]
export const DOCUMENT_KIND_LABELS: Record<DocumentKind, string> = {
  travelers: 'Travelers',
  labels: 'Serial labels',
  lot_report: 'Lot report',
  certificate: 'Certificate of conformance',
  packing_slip: 'Packing slip',
  unit_history: 'Unit history record',
}
export const DOCUMENT_STATUSES = ['queued', 'running', 'done', 'failed'] as const
export type DocumentStatus = (typeof DOCUMENT_STATUSES)[number]

export const LABEL_LAYOUT_KEYS = ['a4_3x8', 'thermal_50x25'] as const
export type LabelLayoutKey = (typeof LABEL_LAYOUT_KEYS)[number]

export const LOT_QUANTITY_MAX = 2000
