import type { LotStatus, UnitState } from '../lots'
import { STATION_KIND_LABELS } from '../stations'
import type { StationKind } from '../stations'

/** Why a unit cannot be worked at a station now, in words for the operator. */
export interface RouteRefusal {
  code: string
  message: string
}

/** The unit as the route rules read it. */
export interface RouteUnit {
  serial: string
  state: UnitState
  holdReason: string
}

/** The unit's lot as the route rules read it. */
export interface RouteLot {
  number: string
  status: LotStatus
  isOnHold: boolean
  holdReason: string
}

/** The step the unit stands at, as the route rules read it. */
export interface RouteStepRef {
  name: string
  stationKind: StationKind
}

/** The station that scanned the unit. */
export interface RouteStation {
  code: string
  name: string
  kind: StationKind
  isActive: boolean
}

/**
 * The route rules of the Floor, in the order an operator should hear them: the station, the lot,
 * then the unit's state, then whether this station is where the unit is due; null when the unit
 * may be worked here. The scan preview, the step-run decision and the bench import's dry run all
 * use this one function.
 */
export function routeRefusal(
  unit: RouteUnit,
  lot: RouteLot,
  step: RouteStepRef | null,
  station: RouteStation,
): RouteRefusal | null {
  const s = unit.serial
  if (!station.isActive)
    return {
      code: 'station_inactive',
      message: `station ${station.code} is retired; use another ${STATION_KIND_LABELS[station.kind].toLowerCase()} station`,
    }
  if (lot.status === 'planned')
    return {
      code: 'lot_not_released',
      message: `lot ${lot.number} is not released yet; ask the production lead`,
    }
  if (lot.status === 'closed')
    return {
      code: 'lot_closed',
      message: `lot ${lot.number} is closed; set ${s} aside and tell the production lead`,
    }
  if (lot.isOnHold)
    return {
      code: 'lot_on_hold',
      message: `lot ${lot.number} is on hold (${lot.holdReason}); set ${s} aside until the production lead lifts the hold`,
    }
  switch (unit.state) {
    case 'on_hold':
      return {
        code: 'unit_on_hold',
        message: `${s} is on hold: ${unit.holdReason}. Set it aside for the production lead to dispose`,
      }
    case 'scrapped':
      return {
        code: 'unit_scrapped',
        message: `${s} was scrapped and must not be worked on; put it in the scrap bin`,
      }
    case 'passed':
    case 'shipped':
    case 'returned':
      return {
        code: 'unit_finished',
        message: `${s} has finished its route (${unit.state.replace('_', ' ')}); nothing more to record here`,
      }
    default:
      break
  }
  if (!step) return { code: 'no_step', message: `${s} has no step to do` }
  if (step.stationKind !== station.kind) {
    const rework = unit.state === 'in_rework' ? ' (in rework)' : ''
    return {
      code: 'not_due_here',
      message: `${s} is waiting for ${step.name}${rework}; this is ${station.name}`,
    }
  }
  return null
}
