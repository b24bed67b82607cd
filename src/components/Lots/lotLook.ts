import type { GridCell, LabelLayoutKey, LotStatus, UnitState } from '@shared/lots'

/** Lot states in words. */
export const LOT_STATUS_LABELS: Record<LotStatus, string> = {
  planned: 'Planned',
  released: 'Released',
  in_progress: 'In progress',
  closed: 'Closed',
}

/** One colour per unit state for count bars; the numbers are always written beside them. */
export const UNIT_STATE_COLOURS: Record<UnitState, string> = {
  queued: '#a3aea9',
  in_progress: '#2f7f8c',
  on_hold: '#d99a1e',
  in_rework: '#a8671c',
  scrapped: '#6b2a22',
  passed: '#2e7d4f',
  shipped: '#3b5b8a',
  returned: '#7d4f9a',
}

/** Each grid cell has a symbol and a pattern of its own, so it reads without colour too. */
export const GRID_CELL_LOOK: Record<GridCell, { symbol: string; label: string }> = {
  not_reached: { symbol: '', label: 'Not reached' },
  in_progress: { symbol: '▸', label: 'Due or in progress' },
  passed_first: { symbol: '✓', label: 'Passed first time' },
  passed_after_rework: { symbol: '↻', label: 'Passed after rework' },
  failed: { symbol: '✕', label: 'Failed' },
}

export const LABEL_LAYOUT_LABELS: Record<LabelLayoutKey, string> = {
  a4_3x8: 'A4 sheet, 3 × 8',
  thermal_50x25: 'Thermal 50 × 25 mm',
}

/** "01 Dec 2026" for a date-only value; an em dash for none. */
export function formatDay(isoDate: string | null): string {
  if (!isoDate) return '—'
  const [y, m, d] = isoDate.slice(0, 10).split('-').map(Number)
  if (!y || !m || !d) return isoDate
  return new Intl.DateTimeFormat('en-GB', {
    day: '2-digit',
    month: 'short',
    year: 'numeric',
    timeZone: 'UTC',
  }).format(new Date(Date.UTC(y, m - 1, d)))
}
