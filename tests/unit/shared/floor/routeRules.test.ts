import { describe, expect, it } from 'vitest'
import { routeRefusal } from '../../../../shared/floor/routeRules'
import type { RouteLot, RouteStation, RouteUnit } from '../../../../shared/floor/routeRules'

// Expected words: the Floor's own refusals, common practice, no source.
const station: RouteStation = {
  code: 'WND-1',
  name: 'Winding bench 1',
  kind: 'winding',
  isActive: true,
}
const lot = (over: Partial<RouteLot> = {}): RouteLot => ({
  number: 'L-0042',
  status: 'in_progress',
  isOnHold: false,
  holdReason: '',
  ...over,
})
const unit = (over: Partial<RouteUnit> = {}): RouteUnit => ({
  serial: 'FP24-2649-00017K',
  state: 'in_progress',
  holdReason: '',
  ...over,
})
const winding = { name: 'Winding', stationKind: 'winding' as const }

describe('routeRefusal', () => {
  it('lets a unit due here be worked', () => {
    expect(routeRefusal(unit(), lot(), winding, station)).toBeNull()
    expect(routeRefusal(unit({ state: 'in_rework' }), lot(), winding, station)).toBeNull()
  })

  it('tells the operator where a unit is expected, and whether it is in rework', () => {
    const hipot = { name: 'Hipot', stationKind: 'hipot' as const }
    expect(routeRefusal(unit(), lot(), hipot, station)?.message).toBe(
      'FP24-2649-00017K is waiting for Hipot; this is Winding bench 1',
    )
    expect(routeRefusal(unit({ state: 'in_rework' }), lot(), hipot, station)?.message).toBe(
      'FP24-2649-00017K is waiting for Hipot (in rework); this is Winding bench 1',
    )
  })

  it('names the lot first: not released, closed, on hold', () => {
    expect(routeRefusal(unit(), lot({ status: 'planned' }), winding, station)?.code).toBe(
      'lot_not_released',
    )
    expect(routeRefusal(unit(), lot({ status: 'closed' }), winding, station)?.code).toBe(
      'lot_closed',
    )
    expect(
      routeRefusal(
        unit({ state: 'on_hold' }),
        lot({ isOnHold: true, holdReason: 'core lot' }),
        winding,
        station,
      )?.message,
    ).toMatch(/lot L-0042 is on hold \(core lot\)/)
  })

  it('then the unit: on hold, scrapped, finished, or with no step', () => {
    const held = routeRefusal(
      unit({ state: 'on_hold', holdReason: 'dropped' }),
      lot(),
      winding,
      station,
    )
    expect(held).toEqual({
      code: 'unit_on_hold',
      message:
        'FP24-2649-00017K is on hold: dropped. Set it aside for the production lead to dispose',
    })
    expect(routeRefusal(unit({ state: 'scrapped' }), lot(), null, station)?.code).toBe(
      'unit_scrapped',
    )
    for (const state of ['passed', 'shipped', 'returned'] as const)
      expect(routeRefusal(unit({ state }), lot(), null, station)?.code).toBe('unit_finished')
    expect(routeRefusal(unit(), lot(), null, station)).toEqual({
      code: 'no_step',
      message: 'FP24-2649-00017K has no step to do',
    })
  })

  it('refuses a retired station before anything else', () => {
    expect(
      routeRefusal(unit(), lot({ status: 'closed' }), winding, { ...station, isActive: false })
        ?.message,
    ).toBe('station WND-1 is retired; use another winding station')
  })
})
