import { randomUUID } from 'node:crypto'
import { beforeAll, describe, expect, it } from 'vitest'
import { resetSignInLimits, signedInAs, uniqueSuffix } from './support/client'
import type { TestClient } from './support/client'

describe('serial-traced parts', () => {
  let engineer: TestClient
  let lead: TestClient
  let stores: TestClient
  let operator: TestClient
  beforeAll(async () => {
    await resetSignInLimits()
    ;[engineer, lead, stores, operator] = await Promise.all(
      ['engineer', 'lead', 'stores', 'operator'].map(signedInAs),
    )
  })

  it('needs one distinct item serial per unit on a serial-traced line', async () => {
    const product = await engineer
      .post('/api/products', { code: `S${uniqueSuffix().slice(0, 5)}`, name: 'Serial test' })
      .expect(201)
    const revId: string = product.body.revisions[0].id
    const step = await engineer
      .post(`/api/revisions/${revId}/steps`, { name: 'Soldering', stationKind: 'soldering' })
      .expect(201)
    await engineer
      .post(`/api/steps/${step.body.id}/checks`, {
        key: 'joints_ok',
        label: 'Joints inspected',
        kind: 'boolean',
      })
      .expect(201)
    const part = await engineer
      .post('/api/parts', { partNumber: `PCB-${uniqueSuffix()}`, description: 'Main board' })
      .expect(201)
    const line = await engineer
      .post(`/api/revisions/${revId}/bom`, {
        partId: part.body.id,
        quantity: 1,
        fittedAtStepId: step.body.id,
        traceLevel: 'serial',
      })
      .expect(201)
    await engineer.post(`/api/revisions/${revId}/release`).expect(200)
    const lot = await lead.post('/api/lots', { revisionId: revId, quantity: 2 }).expect(201)
    await lead.post(`/api/lots/${lot.body.id}/release`).expect(200)
    const [a, b] = (await lead.get(`/api/lots/${lot.body.id}/units`)).body.map(
      (u: { serial: string }) => u.serial,
    )
    const boards = await stores
      .post('/api/component-lots', {
        partId: part.body.id,
        supplierName: 'Boards Ltd',
        supplierLotCode: `B-${uniqueSuffix()}`,
        quantityReceived: 10,
        receivedOn: '2026-11-20',
      })
      .expect(201)
    const run = (serial: string, itemSerial?: string) => ({
      clientEventId: randomUUID(),
      serial,
      stationCode: 'SLD-1',
      values: { joints_ok: true },
      consumptions: [{ bomLineId: line.body.id, code: boards.body.internalCode, itemSerial }],
    })
    const missing = await operator.post('/api/step-runs', run(a))
    expect(missing.status).toBe(400)
    expect(missing.body.fields[`consumptions.${line.body.id}`]).toBe('scan the item’s serial')
    await operator.post('/api/step-runs', run(a, 'mb-0001')).expect(201)
    const reused = await operator.post('/api/step-runs', run(b, 'MB-0001'))
    expect(reused.status).toBe(409)
    expect(reused.body.message).toMatch(/serial MB-0001 is already fitted to another unit/)
    await operator.post('/api/step-runs', run(b, 'MB-0002')).expect(201)
    const stock = (await stores.get(`/api/component-lots/${boards.body.id}`)).body
    expect(stock.quantityRemaining).toBe(8)
  })
})
