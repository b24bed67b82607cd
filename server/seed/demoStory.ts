import { closeLot } from '../services/lots'
import { disposeNonconformance } from '../services/quality'
import { containComponentLot } from '../services/trace'
import { ComponentLot } from '../models'
import { startLot } from './demoFloor'
import { playTogether } from './demoTimeline'
import type { LotTimeline, Person, Scene } from './demoTimeline'
import { LOT_PLANS, MISCOUNTED_UNITS, SUSPECT_CORE_LOT } from './demoPlans'
import type { Plan } from './demoPlans'
import type { DispositionInput } from '../../shared/schemas/lots'
import { coreAlFactor } from './demoReceiving'
import { demoCustomerId, demoReturn, shipLot } from './demoShipping'

// The invented Ferncastle Power's last six weeks (working days 0–29 of demoClock.ts; day 29 is
// the last working day before the seed ran). Eight lots of both products:
//   L-0001  FP24, 16 units: built clean, shipped to Halden Rail Systems; one return, no fault found
//   L-0002  FP12, 12 units: built clean, shipped to Norvale Labs; one return still open
//   L-0003  FP24, 24 units: winding bench WND-2's counter skipped, six secondaries wound with two
//           turns too many; the ratio test failed each, the turn-deviation panel named the bench,
//           the six were rewound at WND-1 and the lot finished
//   L-0004  FP24, 20 units: a hipot breakdown (scrapped), a leakage failure (cleaned, passed on
//           retest) and a scuffed enclosure (used as is, engineer's decision); shipped
//   L-0005  FP12, 14 units: wound on core lot HM-26-0561, which the supplier then flagged; the
//           containment holds every unit of it still in the shop
//   L-0006  FP24, 24 units and L-0007 FP12, 10 units: in progress, spread along the route
//   L-0008  FP24, 18 units: planned, not released

async function lotOf(scene: Scene, p: Plan): Promise<LotTimeline> {
  const { customer, ...plan } = p
  return startLot(scene, {
    ...plan,
    customerId: await demoCustomerId(customer),
    customerName: customer,
    coreAlFactor: coreAlFactor(plan.coreLot),
  })
}

/** Winding bench by unit: the first half of each day's units at WND-1, the rest at WND-2. */
const byHalfDay = (perDay: number) => (i: number) => (i % perDay < perDay / 2 ? 'WND-1' : 'WND-2')

/** The lead closes the lot at shop time day/minute. */
function closeAt(scene: Scene, lot: LotTimeline, day: number, minute: number): void {
  lot.at(day, minute, async () => {
    await closeLot(lot.lotId, scene.cast.lead, scene.clock.at(day, minute))
  })
}

/** Ships the lot's passed units to its plan's customer at shop time day/minute. */
function shipAt(
  scene: Scene,
  lot: LotTimeline,
  plan: Plan,
  [day, minute]: [number, number],
  parcel: { carrier: string; tracking: string },
): void {
  const { cast, clock } = scene
  lot.atShop(day, minute, async () => {
    const out = await shipLot(
      lot.lotId,
      { customerId: await demoCustomerId(plan.customer), orderRef: plan.orderRef, ...parcel },
      { lead: cast.lead, service: cast.service },
      clock.at(day, minute),
    )
    lot.shipped = out.serials
  })
}

/** A customer returns the lot's shipped unit `index`; service closes the case when `closed`. */
function returnAt(
  scene: Scene,
  lot: LotTimeline,
  index: number,
  [day, minute]: [number, number],
  complaint: string,
  closed?: { day: number; minute: number; resolution: 'no_fault_found' },
): void {
  const { cast, clock } = scene
  lot.atShop(day, minute, async () => {
    await demoReturn(
      lot.shipped[index]!,
      complaint,
      cast.service,
      clock.at(day, minute),
      closed && { at: clock.at(closed.day, closed.minute), resolution: closed.resolution },
    )
  })
}

interface Decision {
  disposition: DispositionInput['disposition']
  /** The route position the unit goes back to, for a rework. */
  reworkAt?: number
  reason: string
}

/** Decides the open nonconformance of the lot's unit `unit`. */
async function decide(lot: LotTimeline, unit: number, d: Decision, by: Person, at: Date) {
  await disposeNonconformance(
    lot.failed.get(unit)!,
    {
      disposition: d.disposition,
      reworkToStepId: d.reworkAt ? lot.stepAt(d.reworkAt).id : null,
      reason: d.reason,
      countersign: null,
    },
    by,
    at,
  )
}

/** `by` decides the open nonconformance of the lot's unit `unit` at shop time day/minute. */
function decideAt(
  scene: Scene,
  lot: LotTimeline,
  unit: number,
  [day, minute]: [number, number],
  by: Person,
  d: Decision,
): void {
  lot.at(day, minute, () => decide(lot, unit, d, by, scene.clock.at(day, minute)))
}

/**
 * Plans, releases and builds the eight lots through the services, in shop-time order. Lots are
 * planned in order, so their numbers (L-0001…) and serials are the same on every run.
 */
export async function loadDemoStory(scene: Scene): Promise<void> {
  const { cast, clock } = scene
  const lots: LotTimeline[] = []

  // L-0001: clean, shipped, one return that found nothing wrong.
  const shipped = await lotOf(scene, LOT_PLANS.shipped)
  shipped.flow({ firstDay: 0, perDay: 8, bench: byHalfDay(8) })
  closeAt(scene, shipped, 7, 60)
  shipAt(scene, shipped, LOT_PLANS.shipped, [7, 240], {
    carrier: 'Tarn Valley Freight',
    tracking: 'TVF 3318 0427 91',
  })
  returnAt(
    scene,
    shipped,
    3,
    [16, 150],
    'Unit rattles when shaken; output looks normal on our bench.',
    { day: 18, minute: 420, resolution: 'no_fault_found' },
  )
  lots.push(shipped)

  // L-0002: the small unit, clean, shipped; one return still open.
  const small = await lotOf(scene, LOT_PLANS.shippedWithOpenReturn)
  small.flow({ firstDay: 2, perDay: 6, bench: byHalfDay(6) })
  closeAt(scene, small, 9, 30)
  shipAt(scene, small, LOT_PLANS.shippedWithOpenReturn, [9, 200], {
    carrier: 'Fellgate Couriers',
    tracking: 'FG-55810-2274',
  })
  returnAt(
    scene,
    small,
    7,
    [27, 90],
    'Output drops to about 0 V after 20 minutes at full load; recovers after cooling.',
  )
  lots.push(small)

  // L-0003: the miscount at WND-2, caught and rewound.
  const miscount = await lotOf(scene, LOT_PLANS.miscount)
  miscount.flow({
    firstDay: 9,
    perDay: 6,
    bench: (i) => (i >= 9 && i <= 16 ? 'WND-2' : 'WND-1'),
    turns: (i) => (MISCOUNTED_UNITS.includes(i) ? 94 : 92),
    // The counter showed 92, so the operator typed 92: only the ratio test reads the 94.
    failures: MISCOUNTED_UNITS.map((unit) => ({
      unit,
      position: 1,
      override: {},
      defectCode: 'W-TURNS',
    })),
  })
  miscount.at(12, 420, async () => {
    for (const i of MISCOUNTED_UNITS)
      await decide(
        miscount,
        i,
        {
          disposition: 'rework',
          reworkAt: 1,
          reason:
            'turn-deviation panel: six secondaries from WND-2 read about 2 turns over; its counter skips. Strip and rewind the secondary at WND-1',
        },
        cast.lead,
        clock.at(12, 420),
      )
  })
  for (const [k, i] of MISCOUNTED_UNITS.entries()) {
    miscount.run(i, 1, 12, 500 + k * 40, { bench: 'WND-1', turns: 92, isExtra: true })
    for (let p = 2; p <= 6; p++) miscount.run(i, p, 12 + p - 1, 600 + k * 20 + p, { isExtra: true })
  }
  closeAt(scene, miscount, 18, 60)
  lots.push(miscount)

  // L-0004: hipot breakdown (scrap), leakage (cleaned, retested), a scuff (used as is); shipped.
  const hipot = await lotOf(scene, LOT_PLANS.hipot)
  hipot.flow({
    firstDay: 13,
    perDay: 7,
    bench: byHalfDay(7),
    failures: [
      {
        unit: 5,
        position: 3,
        override: { hipot_outcome: 'breakdown', hipot_leakage: 9.84 },
        defectCode: 'H-BREAK',
      },
      { unit: 12, position: 3, override: { hipot_leakage: 5.62 }, defectCode: 'H-LEAK' },
      { unit: 16, position: 5, override: { cosmetic_ok: false }, defectCode: 'I-COSMETIC' },
    ],
  })
  decideAt(scene, hipot, 5, [16, 100], cast.lead, {
    disposition: 'scrap',
    reason: 'insulation punctured between primary and secondary; not worth rewinding',
  })
  decideAt(scene, hipot, 12, [16, 820], cast.lead, {
    disposition: 'rework',
    reworkAt: 3,
    reason: 'flux residue across the isolation slot: clean with IPA, dry, test again',
  })
  for (let p = 3; p <= 6; p++) hipot.run(12, p, 17 + p - 3, 650 + p, { isExtra: true })
  decideAt(scene, hipot, 16, [19, 700], cast.engineer, {
    disposition: 'use_as_is',
    reason: 'scuff on the enclosure side, under 5 mm and away from the label; no function affected',
  })
  hipot.run(16, 6, 20, 730, { isExtra: true })
  closeAt(scene, hipot, 21, 60)
  shipAt(scene, hipot, LOT_PLANS.hipot, [21, 300], {
    carrier: 'Tarn Valley Freight',
    tracking: 'TVF 3318 5120 06',
  })
  lots.push(hipot)

  // L-0005: wound on the suspect core lot; the containment holds it.
  const contained = await lotOf(scene, LOT_PLANS.contained)
  contained.flow({ firstDay: 19, perDay: 5, bench: byHalfDay(5) })
  contained.at(24, 150, async () => {
    const core = await ComponentLot.findOne({ where: { supplierLotCode: SUSPECT_CORE_LOT } })
    await containComponentLot(
      core!.internalCode,
      'supplier notice: cores of this batch may carry hairline cracks from a kiln fault',
      cast.lead,
      clock.at(24, 150),
    )
    for (const [i] of contained.serials.entries()) contained.held.add(i)
  })
  lots.push(contained)

  // L-0006 and L-0007: in progress; L-0008: planned.
  const busy = await lotOf(scene, LOT_PLANS.inProgress)
  busy.flow({ firstDay: 23, perDay: 3, bench: (i) => (i % 2 ? 'WND-2' : 'WND-1') })
  lots.push(busy)

  const busySmall = await lotOf(scene, LOT_PLANS.inProgressSmall)
  busySmall.flow({ firstDay: 27, perDay: 4, bench: byHalfDay(4) })
  lots.push(busySmall)

  await lotOf(scene, LOT_PLANS.planned)

  await playTogether(lots)
}
