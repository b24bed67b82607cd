import { PDFParse } from 'pdf-parse'
import { beforeAll, describe, expect, it } from 'vitest'
import { mod3736CheckCharacter } from '../../shared/checkCharacter'
import type { UnitTraceDto } from '../../shared/schemas/trace'
import { ServiceCase, Unit } from '../../server/models'
import { LOT_ROLES, signedInRoles, uniqueSuffix } from './support/client'
import { binary } from './support/pdf'
import { loadTestRun, releasedTestLot, windingRun } from './support/floor'
import type { TestLot } from './support/floor'
import { shipTo } from './support/shipments'

describe('trace of a serial', () => {
  const { engineer, lead, stores, operator, service } = signedInRoles(...LOT_ROLES, 'service')
  let t: TestLot
  let reworked: string
  let fresh: string
  let defectId: string

  beforeAll(async () => {
    defectId = (await operator.get('/api/defect-codes')).body.find(
      (d: { code: string }) => d.code === 'W-TURNS',
    ).id
    t = await releasedTestLot({ engineer, lead, stores }, 3)
    reworked = t.units[0]!.serial
    fresh = t.units[1]!.serial
    // Winding, a failed load test, rework back to winding, then both steps again.
    await operator.post('/api/step-runs', windingRun(t, reworked)).expect(201)
    const failed = await operator
      .post('/api/step-runs', loadTestRun(reworked, 340, { defectCodeId: defectId }))
      .expect(201)
    await lead
      .post(`/api/nonconformances/${failed.body.nonconformanceId}/disposition`, {
        disposition: 'rework',
        reworkToStepId: t.rev.steps[0]!.id,
        reason: 'rewind secondary',
      })
      .expect(200)
    await operator.post('/api/step-runs', windingRun(t, reworked)).expect(201)
    await operator.post('/api/step-runs', loadTestRun(reworked, 350.2)).expect(201)
    const { customer } = await shipTo(
      [reworked],
      `Halden Rail ${uniqueSuffix()}`,
      'qa@halden.example',
    )
    const unit = (await Unit.findOne({ where: { serial: reworked } }))!
    await ServiceCase.create({
      number: `SC-${uniqueSuffix()}`,
      unitId: unit.id,
      customerId: customer.id,
      complaint: 'No output after two weeks in the field',
      receivedOn: '2026-12-02',
      defectCodeId: null,
      resolution: null,
      replacementUnitId: null,
      openedBy: null,
      closedBy: null,
      closedAt: null,
    })
    await unit.update({ state: 'returned' })
  }, 120_000)

  it('shows every step run, value, component lot, nonconformance, shipment and return', async () => {
    const res = await service.get(`/api/trace/units/${reworked}`).expect(200)
    const trace = res.body as UnitTraceDto
    expect(trace.unit).toMatchObject({ serial: reworked, state: 'returned', reworkCount: 1 })
    expect(trace.revision).toMatchObject({ id: t.rev.id, letter: t.rev.letter })
    expect(trace.lot.number).toBe(t.lot.number)
    expect(
      trace.stepRuns.map((r) => [r.stepName, r.attempt, r.result, r.isRework, r.stationCode]),
    ).toEqual([
      ['Winding', 1, 'pass', false, 'WND-1'],
      ['Load test', 1, 'fail', false, 'LDT-1'],
      ['Winding', 2, 'pass', true, 'WND-1'],
      ['Load test', 2, 'pass', true, 'LDT-1'],
    ])
    const failedVout = trace.stepRuns[1]!.values.find((v) => v.key === 'vout')
    expect(failedVout).toMatchObject({
      value: 340,
      unit: 'V',
      lower: 345,
      upper: 355,
      isPass: false,
    })
    expect(trace.stepRuns[3]!.values[0]).toMatchObject({ value: 350.2, isPass: true })
    const derived = trace.stepRuns[0]!.values.find((v) => v.key === 'sec_dev')
    expect(derived).toMatchObject({ isDerived: true, unit: 'turns' })
    expect(trace.stepRuns[0]!.operator).toBeTruthy()
    expect(trace.consumptions).toHaveLength(2)
    expect(trace.consumptions[0]).toMatchObject({
      internalCode: t.componentLotCode,
      supplierName: 'Test',
      quantity: 1,
      certificateUrl: null,
    })
    expect(trace.nonconformances).toHaveLength(1)
    expect(trace.nonconformances[0]).toMatchObject({
      stepName: 'Load test',
      defectCode: 'W-TURNS',
      disposition: 'rework',
      reworkToStepName: 'Winding',
      decidedBy: 'Dev Okafor',
      reason: 'rewind secondary',
    })
    expect(trace.shipment).toMatchObject({ carrier: 'Harrow Freight', shippedOn: '2026-12-01' })
    expect(trace.shipment!.customerName).toMatch(/^Halden Rail/)
    expect(trace.serviceCases).toHaveLength(1)
    expect(trace.serviceCases[0]).toMatchObject({
      status: 'open',
      complaint: 'No output after two weeks in the field',
    })
    expect(trace.documents.map((d) => d.kind).sort()).toEqual(['labels', 'travelers'])
  })

  it('takes the traveler URL as well as the bare serial', async () => {
    const url = encodeURIComponent(`https://waymark.example/u/${fresh}`)
    const res = await service.get(`/api/trace/units/${url}`).expect(200)
    expect(res.body.unit.serial).toBe(fresh)
    expect(res.body.stepRuns).toEqual([])
  })

  it('says a serial is mistyped and offers the real one', async () => {
    const body = fresh.slice(0, -1)
    const right = fresh.at(-1)!
    const wrong = right === 'A' ? 'B' : 'A'
    expect(mod3736CheckCharacter(body)).toBe(right)
    const res = await service.get(`/api/trace/units/${body}${wrong}`)
    expect(res.status).toBe(422)
    expect(res.body.error).toBe('serial_mistyped')
    expect(res.body.message).toMatch(/mistyped/)
    expect(res.body.details.suggestions[0]).toBe(fresh)
    expect(res.body.details.suggestions.length).toBeLessThanOrEqual(5)
    // The other real serials of the same product-week follow as neighbours.
    expect(res.body.details.suggestions).toContain(reworked)
  })

  it('finds the serial behind two swapped digits', async () => {
    // The last two sequence digits of the second serial of a lot are 0 and 2.
    const at = fresh.length - 3
    expect(fresh[at]).not.toBe(fresh[at + 1])
    const swapped = fresh.slice(0, at) + fresh[at + 1] + fresh[at] + fresh.slice(at + 2)
    const res = await service.get(`/api/trace/units/${swapped}`)
    expect(res.status).toBe(422)
    expect(res.body.details.suggestions[0]).toBe(fresh)
  })

  it('answers 404 for a well-formed serial that does not exist', async () => {
    const body = `ZZ99-2601-99999`
    const res = await service.get(`/api/trace/units/${body}${mod3736CheckCharacter(body)}`)
    expect(res.status).toBe(404)
    expect(res.body.error).toBe('unknown_serial')
  })

  it('downloads the unit history record as PDF and as JSON', async () => {
    const pdf = await binary(service.get(`/api/trace/units/${reworked}/history.pdf`)).expect(200)
    expect(pdf.headers['content-type']).toMatch(/application\/pdf/)
    expect(pdf.headers['content-disposition']).toMatch(/^attachment; filename="unit-history-/)
    const parser = new PDFParse({ data: pdf.body as Buffer })
    const text = (await parser.getText()).text.replace(/\s+/g, ' ')
    await parser.destroy()
    expect(text).toContain(reworked)
    expect(text).toContain('340 V')
    expect(text).toContain('345–355 V')
    expect(text).toContain(t.componentLotCode)
    expect(text).toContain('W-TURNS')
    expect(text).toContain('No output after two weeks in the field')
    expect(text).toContain('licensed practice govern')
    const json = await service.get(`/api/trace/units/${reworked}/history.json`).expect(200)
    expect(json.headers['content-disposition']).toMatch(/^attachment; filename=".*\.json"/)
    expect(JSON.parse(json.text).stepRuns).toHaveLength(4)
  })

  it('refuses roles without the trace permission', async () => {
    expect((await operator.get(`/api/trace/units/${reworked}`)).status).toBe(403)
    expect((await stores.get(`/api/trace/units/${reworked}`)).status).toBe(403)
    expect((await engineer.get(`/api/trace/units/${reworked}`)).status).toBe(200)
  })
})
