import { STATION_KIND_LABELS } from '../../shared/stations'
import type { Lot, RouteStep, Station, Unit } from '../models'

/** Why a unit cannot be worked at a station now, in words for the operator; null when it can. */
export interface Refusal {
  code: string
  message: string
}

/**
 * The route rules of the Floor, in the order an operator should hear them: the lot first, then
 * the unit's state, then whether this station is where the unit is due. Both the scan preview
 * and the step-run recording use this one function.
 */
export function unitRefusal(
  unit: Pick<Unit, 'serial' | 'state' | 'holdReason'>,
  lot: Pick<Lot, 'number' | 'status' | 'isOnHold' | 'holdReason'>,
  step: Pick<RouteStep, 'name' | 'stationKind'> | null,
  station: Pick<Station, 'code' | 'name' | 'kind' | 'isActive'>,
): Refusal | null {
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
