import { createPinia, setActivePinia } from 'pinia'
import { effectScope, nextTick } from 'vue'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { ApiError } from '@/api/client'
import { floorApi } from '@/api/floor'
import { useFloorStation } from '@/composables/useFloorStation'
import type { FloorPrompts } from '@/composables/useFloorStation'
import { useFloorStore } from '@/stores/floor'
import { floorUnit, numericCheck } from '../components/Floor/fixtures'

vi.mock('@/api/floor', () => ({
  floorApi: {
    unit: vi.fn(),
    componentLot: vi.fn(),
    recent: vi.fn(async () => []),
    recordStepRun: vi.fn(),
  },
}))

function setUp() {
  const prompts: FloorPrompts = {
    focusScan: vi.fn(),
    focusField: vi.fn(),
    askDefect: vi.fn(async () => ({
      defectCodeId: '0b9d6a1e-6f0e-4d5c-9d8e-2f0a4b6c8d10',
      note: 'counted twice',
    })),
    askCountersign: vi.fn(async () => null),
    confirmSwitch: vi.fn(async () => true),
  }
  const station = effectScope().run(() => useFloorStation(prompts))!
  useFloorStore().stationCode = 'WND-1'
  return { prompts, station }
}

describe('useFloorStation', () => {
  beforeEach(() => {
    setActivePinia(createPinia())
    vi.clearAllMocks()
  })

  it('looks up the serial inside a scanned traveler URL and puts the operator in the first reading', async () => {
    vi.mocked(floorApi.unit).mockResolvedValue(floorUnit([numericCheck()]))
    const { prompts, station } = setUp()
    await station.scan('https://waymark.example/u/FP24-2649-00017K')
    expect(floorApi.unit).toHaveBeenCalledWith('FP24-2649-00017K', 'WND-1')
    expect(prompts.focusField).toHaveBeenCalledWith('check:l_primary_a')
  })

  it('shows a refusal big and goes back to the scan box', async () => {
    const refusal = 'FP24-2649-00017K is waiting for Hipot; this is Winding bench 1'
    vi.mocked(floorApi.unit).mockResolvedValue({ ...floorUnit([]), refusal, step: null })
    const { prompts, station } = setUp()
    await station.scan('FP24-2649-00017K')
    expect(station.notice.value).toMatchObject({ tone: 'refusal', title: refusal })
    expect(prompts.focusScan).toHaveBeenCalled()
  })

  it('says a mistyped serial is mistyped', async () => {
    vi.mocked(floorApi.unit).mockRejectedValue(
      new ApiError(
        400,
        'mistyped_serial',
        'FP24-2649-00017X is mistyped: its check character does not match',
      ),
    )
    const { station } = setUp()
    await station.scan('FP24-2649-00017X')
    expect(station.notice.value).toMatchObject({
      tone: 'error',
      title: 'That serial has a typing mistake',
    })
  })

  it('asks for a defect code before recording a fail, then confirms the hold', async () => {
    vi.mocked(floorApi.unit).mockResolvedValue(floorUnit([numericCheck()]))
    vi.mocked(floorApi.recordStepRun).mockResolvedValue({
      stepRun: { id: 'r1', result: 'fail', attempt: 1 },
      unit: { serial: 'FP24-2649-00017K', state: 'on_hold', currentStep: null, reworkCount: 0 },
      nonconformanceId: 'nc1',
    })
    const { prompts, station } = setUp()
    await station.scan('FP24-2649-00017K')
    station.form.setEntry('l_primary_a', '150')
    await nextTick()
    await station.submit()
    expect(prompts.askDefect).toHaveBeenCalled()
    const sent = vi.mocked(floorApi.recordStepRun).mock.calls[0]![0]
    expect(sent).toMatchObject({
      serial: 'FP24-2649-00017K',
      stationCode: 'WND-1',
      values: { l_primary_a: 150 },
      note: 'counted twice',
    })
    expect(station.notice.value).toMatchObject({ tone: 'fail' })
    expect(prompts.focusScan).toHaveBeenCalled()
  })

  it('shows a 409 prominently and keeps the readings', async () => {
    vi.mocked(floorApi.unit).mockResolvedValue(floorUnit([numericCheck()]))
    vi.mocked(floorApi.recordStepRun).mockRejectedValue(
      new ApiError(409, 'lot_on_hold', 'lot L-0042 is on hold (core supplier query)'),
    )
    const { station } = setUp()
    await station.scan('FP24-2649-00017K')
    station.form.setEntry('l_primary_a', '108')
    await station.submit()
    expect(station.formNotice.value).toMatchObject({
      tone: 'error',
      title: 'Lot L-0042 is on hold (core supplier query)',
    })
    expect(station.form.entries.l_primary_a).toBe('108')
  })
})

describe('useFloorStation, scans that are not a traveler', () => {
  beforeEach(() => {
    setActivePinia(createPinia())
    vi.clearAllMocks()
  })

  it('names a bare component lot code scanned with no unit open, and asks nothing', async () => {
    const { station, prompts } = setUp()
    await station.scan('CL-26-00002C')
    expect(station.notice.value?.title).toBe('That is component lot CL-26-00002C')
    expect(floorApi.unit).not.toHaveBeenCalled()
    expect(prompts.focusScan).toHaveBeenCalled()
  })

  it('names a lot label’s link the same way', async () => {
    const { station } = setUp()
    await station.scan('https://shop.example/c/CL-26-00001E')
    expect(station.notice.value?.title).toBe('That is component lot CL-26-00001E')
  })

  it('says a badge is a badge, never looking it up as a unit', async () => {
    const { station } = setUp()
    await station.scan('BADGE-7K3M9Q2X5T8V4R6W')
    expect(station.notice.value?.title).toBe('That is a person’s badge')
    expect(floorApi.unit).not.toHaveBeenCalled()
  })
})
