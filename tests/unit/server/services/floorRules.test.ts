import { describe, expect, it } from 'vitest'
import type { Lot, Station, Unit } from '../../../../server/models'
import { unitRefusal } from '../../../../server/services/floorRules'

// Plain objects stand in for the model rows: unitRefusal only reads their fields.
const station = {
  code: 'WND-1',
  name: 'Winding bench 1',
  kind: 'winding',
  isActive: true,
} as Station
const lot = (over: Partial<Lot> = {}) =>
  ({ number: 'L-0042', status: 'in_progress', isOnHold: false, holdReason: '', ...over }) as Lot
const unit = (over: Partial<Unit> = {}) =>
  ({ serial: 'FP24-2649-00017K', state: 'in_progress', holdReason: '', ...over }) as Unit
const winding = { name: 'Winding', stationKind: 'winding' as const }

describe('unitRefusal', () => {
  it('lets a unit due here be worked', () => {
    expect(unitRefusal(unit(), lot(), winding, station)).toBeNull()
  })

  it('tells the operator where a unit is expected', () => {
    expect(
      unitRefusal(unit(), lot(), { name: 'Hipot', stationKind: 'hipot' }, station)?.message,
    ).toBe('FP24-2649-00017K is waiting for Hipot; this is Winding bench 1')
  })

  it('names the lot first: not released, closed, on hold', () => {
    expect(unitRefusal(unit(), lot({ status: 'planned' }), winding, station)?.code).toBe(
      'lot_not_released',
    )
    expect(unitRefusal(unit(), lot({ status: 'closed' }), winding, station)?.code).toBe(
      'lot_closed',
    )
    expect(
      unitRefusal(
        unit({ state: 'on_hold' }),
        lot({ isOnHold: true, holdReason: 'core lot' }),
        winding,
        station,
      )?.message,
    ).toMatch(/lot L-0042 is on hold \(core lot\)/)
  })

  it('refuses a retired station before anything else', () => {
    expect(
      unitRefusal(unit(), lot(), winding, { ...station, isActive: false } as Station)?.code,
    ).toBe('station_inactive')
  })
})
