import type { TraceLevel } from '@shared/recipeDefinitions'

export const TRACE_LEVEL_LABELS: Record<TraceLevel, string> = {
  lot: 'Component lot',
  serial: 'Own serial',
}

/** What each level asks of the operator when the part is fitted. */
export const TRACE_LEVEL_HINTS: Record<TraceLevel, string> = {
  lot: 'The operator scans the component lot the part came from.',
  serial: 'The part carries its own serial; the operator scans it on every unit.',
}
