/** Kinds of station on the floor; a route step names the kind it runs at (DESIGN.md §4). */
export const STATION_KINDS = [
  'winding',
  'soldering',
  'hipot',
  'load_test',
  'inspection',
  'packing',
  'other',
] as const
export type StationKind = (typeof STATION_KINDS)[number]

export const STATION_KIND_LABELS: Record<StationKind, string> = {
  winding: 'Winding',
  soldering: 'Soldering',
  hipot: 'Hipot',
  load_test: 'Load test',
  inspection: 'Inspection',
  packing: 'Packing',
  other: 'Other',
}

/** Station kinds whose steps handle lethal voltages and must show the high-voltage caution. */
export const HIGH_VOLTAGE_KINDS: readonly StationKind[] = ['hipot', 'load_test']

export const STATION_CODE_MAX_LENGTH = 16
export const STATION_NAME_MAX_LENGTH = 80
