import type { StationKind } from '../../shared/stations'

/** The invented demo shop's floor: two winding benches so a drifting bench can be told apart. */
export const DEMO_STATIONS: readonly { code: string; name: string; kind: StationKind }[] = [
  { code: 'WND-1', name: 'Winding bench 1', kind: 'winding' },
  { code: 'WND-2', name: 'Winding bench 2', kind: 'winding' },
  { code: 'SLD-1', name: 'Soldering bench 1', kind: 'soldering' },
  { code: 'HPT-1', name: 'Hipot tester cage', kind: 'hipot' },
  { code: 'LDT-1', name: 'Load-test rack 1', kind: 'load_test' },
  { code: 'INS-1', name: 'Final inspection', kind: 'inspection' },
  { code: 'PCK-1', name: 'Packing table', kind: 'packing' },
]
