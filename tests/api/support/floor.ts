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
  const rev = await buildSmallRecipe(clients.engineer)
  await clients.engineer.post(`/api/revisions/${rev.id}/release`).expect(200)
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
      supplierLotCode: `S-${uniqueSuffix()}`,
      quantityReceived: stock,
      receivedOn: '2026-11-01',
    })
    .expect(201)
  return { rev, lot, units, componentLotCode: cl.body.internalCode }
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
