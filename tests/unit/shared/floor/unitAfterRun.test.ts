import { describe, expect, it } from 'vitest'
import { unitAfterRun } from '../../../../shared/floor/unitAfterRun'

const at = new Date('2026-12-02T09:00:00Z')
const queued = {
  state: 'queued' as const,
  currentStepId: 'step-2',
  reworkUntilPosition: null,
  finishedAt: null,
  holdKind: null,
  heldFromState: null,
  holdReason: '',
}
const next = { id: 'step-3', name: 'Hipot', stationKind: 'hipot' as const, position: 3 }
const step = { name: 'Soldering', position: 2, next }

describe('unitAfterRun', () => {
  it('moves a passing unit to the next step, in progress', () => {
    expect(unitAfterRun(queued, step, [], at)).toMatchObject({
      state: 'in_progress',
      currentStepId: 'step-3',
      finishedAt: null,
      reworkUntilPosition: null,
    })
  })

  it('ends the route as passed after the last step, with the time it finished', () => {
    expect(unitAfterRun(queued, { ...step, next: null }, [], at)).toMatchObject({
      state: 'passed',
      currentStepId: null,
      finishedAt: at,
    })
  })

  it('holds a failing unit at its step, saying what failed and where it came from', () => {
    expect(unitAfterRun(queued, step, ['joints', 'flux'], at)).toMatchObject({
      state: 'on_hold',
      currentStepId: 'step-2',
      holdKind: 'nonconformance',
      heldFromState: 'queued',
      holdReason: 'failed Soldering (joints, flux)',
    })
  })

  it('keeps a reworked unit in rework until it passes the step that failed', () => {
    const reworking = { ...queued, state: 'in_rework' as const, reworkUntilPosition: 3 }
    expect(unitAfterRun(reworking, step, [], at)).toMatchObject({
      state: 'in_rework',
      reworkUntilPosition: 3,
    })
    expect(unitAfterRun(reworking, { ...step, position: 3 }, [], at)).toMatchObject({
      state: 'in_progress',
      reworkUntilPosition: null,
    })
  })
})
