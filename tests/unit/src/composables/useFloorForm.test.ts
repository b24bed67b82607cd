import { nextTick, ref } from 'vue'
import { describe, expect, it, vi } from 'vitest'
import type { FloorComponentLotDto, FloorUnitDto } from '@shared/schemas/lots'
import { lotFieldId, useFloorForm } from '@/composables/useFloorForm'
import { bomLine, floorUnit, numericCheck } from '../components/Floor/fixtures'

const CORE = bomLine()
const BOARD = bomLine({
  id: '7a2d4e4a-3e1f-4b68-8e1d-2a8f2d1f1b02',
  partId: 'part-pcb',
  partNumber: 'PCB-FP24-B',
  traceLevel: 'serial',
})

function okLot(code: string): FloorComponentLotDto {
  return {
    internalCode: code,
    partId: 'part-core',
    partNumber: 'FCS-3000U',
    status: 'available',
    isExpired: false,
    quantityRemaining: 80,
    refusal: null,
  }
}

function setUp(lookup = vi.fn(async (code: string) => okLot(code))) {
  const unit = ref<FloorUnitDto | null>(floorUnit([numericCheck()], [CORE, BOARD]))
  return { unit, lookup, form: useFloorForm(unit, lookup) }
}

describe('useFloorForm', () => {
  it('walks readings first, then each lot and item serial', () => {
    const { form } = setUp()
    expect(form.fieldIds.value).toEqual([
      'check:l_primary_a',
      `lot:${CORE.id}`,
      `lot:${BOARD.id}`,
      `item:${BOARD.id}`,
    ])
  })

  it('sends the code inside a scanned lot label, and the same event id on every retry', async () => {
    const { form, lookup } = setUp()
    form.setEntry('l_primary_a', '108,5')
    form.setScanned(CORE.id, 'https://w.example/c/cl-26-000048')
    form.setScanned(BOARD.id, 'CL-26-000099')
    form.setItemSerial(BOARD.id, 'pcb-0007')
    expect(await form.firstProblem()).toBeNull()
    expect(lookup).toHaveBeenCalledWith('CL-26-000048', CORE.id)

    const extra = {
      serial: 'FP24-2649-00017K',
      stationCode: 'WND-1',
      defectCodeId: null,
      note: '',
      countersign: null,
    }
    const first = form.toInput(extra)
    expect(first.values).toEqual({ l_primary_a: 108.5 })
    expect(first.consumptions).toEqual([
      { bomLineId: CORE.id, code: 'CL-26-000048' },
      { bomLineId: BOARD.id, code: 'CL-26-000099', itemSerial: 'PCB-0007' },
    ])
    expect(form.toInput(extra).clientEventId).toBe(first.clientEventId)
  })

  it('makes a new event id for the next unit', async () => {
    const { form, unit } = setUp()
    const before = form.clientEventId.value
    unit.value = floorUnit([numericCheck()])
    await nextTick()
    expect(form.clientEventId.value).not.toBe(before)
    expect(form.clientEventId.value).toMatch(
      /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/,
    )
  })

  it('names what is missing, in field order', async () => {
    const { form } = setUp()
    expect(await form.firstProblem()).toEqual({
      fieldId: 'check:l_primary_a',
      message: 'Inductance, primary A: type the reading',
    })
    form.setEntry('l_primary_a', '108')
    expect((await form.firstProblem())?.fieldId).toBe(`lot:${CORE.id}`)
  })

  it('stops at a lot the server refuses and says why', async () => {
    const refused = {
      ...okLot('CL-26-000013'),
      status: 'quarantined' as const,
      refusal: 'CL-26-000013 is quarantined; take a lot that is available',
    }
    const { form } = setUp(vi.fn(async () => refused))
    form.setEntry('l_primary_a', '108')
    form.setScanned(CORE.id, 'CL-26-000013')
    await form.verifyMaterial(CORE.id)
    expect(form.materials.value[0]!.status).toBe('refused')
    expect(await form.firstProblem()).toEqual({
      fieldId: lotFieldId(CORE.id),
      message: refused.refusal,
    })
  })

  it('asks about a lot once when Enter and leaving the field both ask for it', async () => {
    let answer: (lot: FloorComponentLotDto) => void = () => undefined
    const lookup = vi.fn(
      (code: string) =>
        new Promise<FloorComponentLotDto>((resolve) => {
          answer = () => resolve(okLot(code))
        }),
    )
    const { form } = setUp(lookup)
    form.setScanned(CORE.id, 'CL-26-000048')
    const onEnter = form.verifyMaterial(CORE.id)
    const onBlur = form.verifyMaterial(CORE.id)
    answer(okLot('CL-26-000048'))
    await Promise.all([onEnter, onBlur])
    expect(lookup).toHaveBeenCalledTimes(1)
    expect(form.materials.value[0]!.status).toBe('ok')
    // A different code scanned over it is asked about, of course.
    form.setScanned(CORE.id, 'CL-26-000056')
    const again = form.verifyMaterial(CORE.id)
    answer(okLot('CL-26-000056'))
    await again
    expect(lookup).toHaveBeenCalledTimes(2)
  })

  it('puts the server’s field messages on the fields they name', () => {
    const { form } = setUp()
    const rest = form.applyServerErrors({
      'values.l_primary_a': 'must be a number',
      [`consumptions.${CORE.id}`]: 'no component lot CL-1',
      countersign: 'e-mail or password is wrong',
    })
    expect(form.serverErrors.value).toEqual({
      'check:l_primary_a': 'must be a number',
      [`lot:${CORE.id}`]: 'no component lot CL-1',
    })
    expect(rest).toEqual([{ field: 'countersign', message: 'e-mail or password is wrong' }])
  })
})
