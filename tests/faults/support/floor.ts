import { randomUUID } from 'node:crypto'
import type { HttpClient } from './http'

const suffix = () => Math.random().toString(36).slice(2, 7).toUpperCase()

export interface FaultLot {
  lotId: string
  serials: string[]
  windingStepId: string
  loadStepId: string
  bomLineId: string
  componentLotCode: string
  defectCodeId: string
}

export interface Roles {
  engineer: HttpClient
  lead: HttpClient
  stores: HttpClient
}

/**
 * Through the API: a released two-step recipe (winding with a part fitted from a component lot,
 * so its scans take the locked path; then a load test, which takes the unlocked one), a released
 * lot of `quantity` and a component lot with one piece per unit. The fault stack has no demo
 * recipes, so the defect code is made here too.
 */
export async function releasedLot(who: Roles, quantity: number): Promise<FaultLot> {
  const { engineer, lead, stores } = who
  const post = (c: HttpClient, path: string, body?: unknown, status = 201) =>
    c.must('POST', path, body, status).then((r) => r.body)
  const code = `F${suffix()}`
  const defect = await post(engineer, '/api/defect-codes', {
    code: `W-${suffix()}`,
    description: 'Turn count wrong on a winding',
    stationKinds: ['winding'],
  })
  const product = await post(engineer, '/api/products', { code, name: `Fault unit ${code}` })
  const revId: string = product.revisions[0].id
  const winding = await post(engineer, `/api/revisions/${revId}/windings`, {
    name: 'secondary',
    nominalTurns: 92,
    alNanoHenry: 3000,
  })
  const wind = await post(engineer, `/api/revisions/${revId}/steps`, {
    name: 'Winding',
    stationKind: 'winding',
  })
  const load = await post(engineer, `/api/revisions/${revId}/steps`, {
    name: 'Load test',
    stationKind: 'load_test',
    safetyNote: 'High voltage.',
  })
  await post(engineer, `/api/steps/${wind.id}/checks`, {
    key: 'l_sec',
    label: 'Inductance',
    kind: 'numeric',
    unit: 'mH',
    lower: 19,
    upper: 32,
  })
  await post(engineer, `/api/steps/${wind.id}/checks`, {
    key: 'sec_dev',
    label: 'Deviation',
    kind: 'numeric',
    unit: 'turns',
    lower: -12,
    upper: 12,
    derived: 'turn_deviation',
    derivedInputs: { inductance: 'l_sec', winding: winding.id },
  })
  await post(engineer, `/api/steps/${load.id}/checks`, {
    key: 'vout',
    label: 'Output',
    kind: 'numeric',
    unit: 'V',
    lower: 345,
    upper: 355,
  })
  const part = await post(engineer, '/api/parts', {
    partNumber: `FP-${suffix()}`,
    description: 'Test core',
    unitOfMeasure: 'set',
  })
  const bom = await post(engineer, `/api/revisions/${revId}/bom`, {
    partId: part.id,
    quantity: 1,
    fittedAtStepId: wind.id,
  })
  await post(engineer, `/api/revisions/${revId}/release`, undefined, 200)
  const created = await post(lead, '/api/lots', {
    revisionId: revId,
    quantity,
    orderRef: `PO-${suffix()}`,
  })
  await post(lead, `/api/lots/${created.id}/release`, undefined, 200)
  const units = (await lead.must('GET', `/api/lots/${created.id}/units`, undefined, 200)).body as {
    serial: string
  }[]
  const componentLot = await post(stores, '/api/component-lots', {
    partId: part.id,
    supplierName: 'Test',
    supplierLotCode: `S-${suffix()}`,
    quantityReceived: quantity,
    receivedOn: '2026-11-01',
  })
  return {
    lotId: created.id,
    serials: units.map((u) => u.serial),
    windingStepId: wind.id,
    loadStepId: load.id,
    bomLineId: bom.id,
    componentLotCode: componentLot.internalCode,
    defectCodeId: defect.id,
  }
}

/** A passing winding scan of `serial` (25.39 mH: 92 turns on AL 3000), with a new event id. */
export function windingScan(lot: FaultLot, serial: string, over: Record<string, unknown> = {}) {
  return {
    clientEventId: randomUUID(),
    serial,
    stationCode: 'WND-1',
    values: { l_sec: 25.39 },
    consumptions: [{ bomLineId: lot.bomLineId, code: lot.componentLotCode }],
    ...over,
  }
}

/** A passing load test of `serial` (350 V, inside 345–355 V), with a new event id. */
export function loadScan(serial: string) {
  return { clientEventId: randomUUID(), serial, stationCode: 'LDT-1', values: { vout: 350 } }
}
