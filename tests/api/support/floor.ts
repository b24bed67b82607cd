import { randomUUID } from 'node:crypto'
import type { LotDto, UnitSummaryDto } from '../../../shared/schemas/lots'
import type { RevisionDto } from '../../../shared/schemas/recipes'
import type { TestClient } from './client'
import { uniqueSuffix } from './client'
import { buildSmallRecipe } from './recipes'

export interface TestLot {
  rev: RevisionDto
  lot: LotDto
  units: UnitSummaryDto[]
  componentLotCode: string
}

/**
 * A released two-step recipe (winding, then load test) and a released lot of it, plus a
 * component lot of the part fitted at winding with `stock` pieces in it.
 */
export async function releasedTestLot(
  clients: { engineer: TestClient; lead: TestClient; stores: TestClient },
  quantity: number,
  stock = 100,
): Promise<TestLot> {
  return releasedLotOf(clients, await buildSmallRecipe(clients.engineer), quantity, { stock })
}

/**
 * Releases the draft `draft` (a test may change it first), makes a released lot of `quantity`
 * units of it and receives a component lot of its first BOM part.
 */
export async function releasedLotOf(
  clients: { engineer: TestClient; lead: TestClient; stores: TestClient },
  draft: RevisionDto,
  quantity: number,
  { stock = 100, supplierLotCode = `S-${uniqueSuffix()}` } = {},
): Promise<TestLot> {
  const rev = (await clients.engineer.post(`/api/revisions/${draft.id}/release`).expect(200))
    .body as RevisionDto
  const created = await clients.lead
    .post('/api/lots', { revisionId: rev.id, quantity, orderRef: `PO-${uniqueSuffix()}` })
    .expect(201)
  const lot = (await clients.lead.post(`/api/lots/${created.body.id}/release`).expect(200))
    .body as LotDto
  const units = (await clients.lead.get(`/api/lots/${lot.id}/units`).expect(200))
    .body as UnitSummaryDto[]
  const cl = await clients.stores
    .post('/api/component-lots', {
      partId: rev.bom[0]!.partId,
      supplierName: 'Test',
      supplierLotCode,
      quantityReceived: stock,
      receivedOn: '2026-11-01',
    })
    .expect(201)
  return { rev, lot, units, componentLotCode: cl.body.internalCode as string }
}

/** A winding submission for `serial`; 24.3 mH is 90 turns on AL 3000 (a 2-turn miscount). */
export function windingRun(t: TestLot, serial: string, over: Record<string, unknown> = {}) {
  return {
    clientEventId: randomUUID(),
    serial,
    stationCode: 'WND-1',
    values: { l_sec: 25.39 },
    consumptions: [{ bomLineId: t.rev.bom[0]!.id, code: t.componentLotCode }],
    ...over,
  }
}

export function loadTestRun(serial: string, vout: number, over: Record<string, unknown> = {}) {
  return { clientEventId: randomUUID(), serial, stationCode: 'LDT-1', values: { vout }, ...over }
}

/** The mixed lot of five the yield and lot-report tests read, and the answer to unit 3's re-test. */
export interface MixedLot {
  t: TestLot
  /** Unit 3's passing load test after its rework (attempt 2). */
  reworkedRetest: { body: { stepRun: { attempt: number }; unit: { state: string } } }
}

/**
 * A released lot of five run through the Floor: units 1 and 2 pass both steps at the first
 * attempt; unit 3 fails the load test (340 V), is reworked back to Winding and passes both at
 * attempt 2; unit 4 reads 40 mH at winding and is scrapped; unit 5 passes winding and waits at
 * the load test.
 */
export async function runMixedLot(clients: {
  engineer: TestClient
  lead: TestClient
  stores: TestClient
  operator: TestClient
}): Promise<MixedLot> {
  const { lead, operator } = clients
  const codes = (await operator.get('/api/defect-codes').expect(200)).body as {
    id: string
    code: string
  }[]
  const defect = (code: string) => codes.find((d) => d.code === code)!.id
  const t = await releasedTestLot(clients, 5)
  const [u1, u2, u3, u4, u5] = t.units.map((u) => u.serial) as [
    string,
    string,
    string,
    string,
    string,
  ]
  const run = (body: object) => operator.post('/api/step-runs', body).expect(201)
  const dispose = (nc: string, body: object) =>
    lead.post(`/api/nonconformances/${nc}/disposition`, body).expect(200)
  for (const s of [u1, u2]) {
    await run(windingRun(t, s))
    await run(loadTestRun(s, 350))
  }
  await run(windingRun(t, u3))
  const low = await run(loadTestRun(u3, 340, { defectCodeId: defect('L-VOUT') }))
  await dispose(low.body.nonconformanceId, {
    disposition: 'rework',
    reworkToStepId: t.rev.steps[0]!.id,
    reason: 'rewind secondary',
  })
  await run(windingRun(t, u3))
  const reworkedRetest = await run(loadTestRun(u3, 350))
  const turns = await run(
    windingRun(t, u4, { values: { l_sec: 40 }, defectCodeId: defect('W-TURNS') }),
  )
  await dispose(turns.body.nonconformanceId, { disposition: 'scrap', reason: 'core cracked' })
  await run(windingRun(t, u5))
  return { t, reworkedRetest }
}
