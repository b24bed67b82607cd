import { randomUUID } from 'node:crypto'
import type { CheckValue } from '../../shared/recipes/evaluate'
import type { RevisionDto } from '../../shared/schemas/recipes'
import { Customer, DefectCode, Lot, Product, User } from '../models'
import type { Actor } from '../services/admin'
import { listLotUnits } from '../services/lots'
import { closeLot, createLot, releaseLot } from '../services/lots'
import { disposeNonconformance, listNonconformances } from '../services/quality'
import { getRevision } from '../services/recipes'
import { recordStepRun } from '../services/floor'
import { DEMO_PASSWORD } from './demoUsers'
import { demoReadings, seededRandom } from './demoReadings'
import type { UnitTruth } from './demoReadings'

interface People {
  operator: Actor
  lead: Actor & { role: string }
}

async function person(email: string): Promise<Actor & { role: string }> {
  const u = (await User.findOne({ where: { email } }))!
  return { id: u.id, email: u.email, role: u.role, ip: null, requestId: 'demo-seed' }
}

const STATION_FOR: Record<string, string[]> = {
  winding: ['WND-1', 'WND-2'],
  soldering: ['SLD-1'],
  hipot: ['HPT-1'],
  load_test: ['LDT-1'],
  inspection: ['INS-1'],
  packing: ['PCK-1'],
}

/**
 * Walks one unit through `steps` steps of its route through the same service the Floor calls,
 * with readings that follow from the unit's truth; a forced failing value opens a
 * nonconformance with `defect`.
 */
async function walk(
  rev: RevisionDto,
  serial: string,
  steps: number,
  truth: (step: number) => UnitTruth,
  people: People,
  rnd: () => number,
  defect?: string,
  bench = 0,
) {
  for (const step of rev.steps.slice(0, steps)) {
    const stations = STATION_FOR[step.stationKind]!
    const t = truth(step.position)
    const values: Record<string, CheckValue> = demoReadings(step, rev.windings, t, rnd)
    const lines = rev.bom.filter((b) => b.fittedAtStepId === step.id)
    const consumptions = await Promise.all(
      lines.map((l) =>
        demoConsumption(
          l.partId,
          l.id,
          l.traceLevel === 'serial' ? `${l.partNumber}-${serial.slice(-6)}` : undefined,
        ),
      ),
    )
    const defectCodeId =
      t.override && defect
        ? ((await DefectCode.findOne({ where: { code: defect } }))?.id ?? null)
        : null
    await recordStepRun(
      {
        clientEventId: randomUUID(),
        serial,
        stationCode: stations[bench % stations.length]!,
        values,
        consumptions,
        defectCodeId,
        note: '',
        countersign: step.requiresSignoff
          ? { email: people.lead.email!, password: DEMO_PASSWORD }
          : null,
      },
      people.operator,
    )
    if (t.override) return
  }
}

let lotCodes = new Map<string, string>()
async function demoConsumption(partId: string, bomLineId: string, itemSerial?: string) {
  const { ComponentLot } = await import('../models')
  let code = lotCodes.get(partId)
  if (!code) {
    const lot = await ComponentLot.findOne({
      where: { partId, status: 'available' },
      order: [['receivedOn', 'DESC']],
    })
    code = lot!.internalCode
    lotCodes.set(partId, code)
  }
  return { bomLineId, code, itemSerial }
}

/** The demo customer of this name, made by loadDemoCustomers; null if it is missing. */
async function customerId(name: string): Promise<string | null> {
  return (await Customer.findOne({ where: { name } }))?.id ?? null
}

async function releasedRevision(code: string, letter: string): Promise<RevisionDto> {
  const product = (await Product.findOne({ where: { code }, include: ['revisions'] }))!
  return getRevision(product.revisions!.find((r) => r.letter === letter)!.id)
}

/** The demo lots: one finished, one spread across the floor with a rework and a scrap, one planned. */
export async function loadDemoLots(): Promise<void> {
  if ((await Lot.count()) > 0) return
  lotCodes = new Map()
  const people = {
    operator: await person('operator@ferncastle.example'),
    lead: await person('lead@ferncastle.example'),
  }
  const fp24 = await releasedRevision('FP24', 'B')
  const rnd = seededRandom(2649)
  const nominal = (alFactor: number) => () => ({ secondaryTurns: 92, alFactor })

  const done = await createLot(
    {
      revisionId: fp24.id,
      quantity: 12,
      orderRef: 'HRS-4471',
      customerName: 'Halden Rail Systems',
      customerId: await customerId('Halden Rail Systems'),
      dueDate: '2026-11-27',
    },
    people.lead,
  )
  await releaseLot(done.id, people.lead, new Date('2026-11-16T08:00:00Z'))
  for (const [i, u] of (await listLotUnits(done.id)).entries())
    await walk(fp24, u.serial, 6, nominal(1.04), people, rnd, undefined, i)
  await closeLot(done.id, people.lead)

  const busy = await createLot(
    {
      revisionId: fp24.id,
      quantity: 20,
      orderRef: 'CI-2210',
      customerName: 'Corrin Instruments',
      customerId: await customerId('Corrin Instruments'),
      dueDate: '2026-12-11',
    },
    people.lead,
  )
  await releaseLot(busy.id, people.lead, new Date('2026-11-30T07:30:00Z'))
  const units = await listLotUnits(busy.id)
  for (const [i, u] of units.entries()) {
    const reach = [6, 6, 6, 5, 5, 4, 4, 4, 3, 3, 3, 2, 2, 2, 1, 1, 1, 0, 0, 0][i]!
    if (i === 6)
      await walk(
        fp24,
        u.serial,
        3,
        (p) => ({
          ...nominal(0.97)(),
          override: p === 3 ? { hipot_outcome: 'breakdown', hipot_leakage: 9.8 } : undefined,
        }),
        people,
        rnd,
        'H-BREAK',
        i,
      )
    else if (i === 9)
      await walk(
        fp24,
        u.serial,
        4,
        (p) => ({ ...nominal(0.97)(), override: p === 4 ? { case_temp: 88 } : undefined }),
        people,
        rnd,
        'L-HOT',
        i,
      )
    else await walk(fp24, u.serial, reach, nominal(0.97), people, rnd, undefined, i)
  }
  const open = await listNonconformances({ lotId: busy.id, status: 'open' })
  const hipotFail = open.find((n) => n.stepName === 'Hipot')!
  await disposeNonconformance(
    hipotFail.id,
    {
      disposition: 'rework',
      reworkToStepId: fp24.steps[0]!.id,
      reason: 'secondary insulation punctured: rewind with an extra tape layer',
      countersign: null,
    },
    people.lead,
  )
  const hotFail = open.find((n) => n.stepName === 'Load test')!
  await disposeNonconformance(
    hotFail.id,
    {
      disposition: 'scrap',
      reworkToStepId: null,
      reason: 'switching transistor overheated and cracked the board',
      countersign: null,
    },
    people.lead,
  )

  const fp12 = await releasedRevision('FP12', 'A')
  await createLot(
    {
      revisionId: fp12.id,
      quantity: 8,
      orderRef: 'NV-0093',
      customerName: 'Norvale Labs',
      customerId: await customerId('Norvale Labs'),
      dueDate: '2027-01-15',
    },
    people.lead,
  )
}
