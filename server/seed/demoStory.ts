import { closeLot } from '../services/lots'
import { disposeNonconformance } from '../services/quality'
import { containComponentLot } from '../services/trace'
import { ComponentLot } from '../models'
import { startLot } from './demoFloor'
import { playTogether } from './demoTimeline'
import type { LotTimeline, Scene } from './demoTimeline'
import { DEMO_ORDER_REFS, LOT_PLANS, MISCOUNTED_UNITS, SUSPECT_CORE_LOT } from './demoPlans'
import type { Plan } from './demoPlans'
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

/**
 * Plans, releases and builds the eight lots through the services, in shop-time order. Lots are
 * planned in order, so their numbers (L-0001…) and serials are the same on every run.
 */
export async function loadDemoStory(scene: Scene): Promise<void> {
  const { cast, clock } = scene
  const people = { lead: cast.lead, service: cast.service }
  const lots: LotTimeline[] = []

  // L-0001: clean, shipped, one return that found nothing wrong.
  const shipped = await lotOf(scene, LOT_PLANS.shipped)
  shipped.flow({ firstDay: 0, perDay: 8, bench: byHalfDay(8) })
  shipped.at(7, 60, async () => {
    await closeLot(shipped.lotId, cast.lead, clock.at(7, 60))
  })
  shipped.atShop(7, 240, async () => {
    const out = await shipLot(
      shipped.lotId,
      {
        customerId: await demoCustomerId('Halden Rail Systems'),
        orderRef: DEMO_ORDER_REFS.shipped,
        carrier: 'Tarn Valley Freight',
        tracking: 'TVF 3318 0427 91',
      },
      people,
      clock.at(7, 240),
    )
    shipped.shipped = out.serials
  })
  shipped.atShop(16, 150, async () => {
    await demoReturn(
      shipped.shipped[3]!,
      'Unit rattles when shaken; output looks normal on our bench.',
      cast.service,
      clock.at(16, 150),
      { at: clock.at(18, 420), resolution: 'no_fault_found' },
    )
  })
  lots.push(shipped)

  // L-0002: the small unit, clean, shipped; one return still open.
  const small = await lotOf(scene, LOT_PLANS.shippedWithOpenReturn)
  small.flow({ firstDay: 2, perDay: 6, bench: byHalfDay(6) })
  small.at(9, 30, async () => {
    await closeLot(small.lotId, cast.lead, clock.at(9, 30))
  })
  small.atShop(9, 200, async () => {
    const out = await shipLot(
      small.lotId,
      {
        customerId: await demoCustomerId('Norvale Labs'),
        orderRef: DEMO_ORDER_REFS.shippedWithOpenReturn,
        carrier: 'Fellgate Couriers',
        tracking: 'FG-55810-2274',
      },
      people,
      clock.at(9, 200),
    )
    small.shipped = out.serials
  })
  small.atShop(27, 90, async () => {
    await demoReturn(
      small.shipped[7]!,
      'Output drops to about 0 V after 20 minutes at full load; recovers after cooling.',
      cast.service,
      clock.at(27, 90),
    )
  })
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
      await disposeNonconformance(
        miscount.failed.get(i)!,
        {
          disposition: 'rework',
          reworkToStepId: miscount.stepAt(1).id,
          reason:
            'turn-deviation panel: six secondaries from WND-2 read about 2 turns over; its counter skips. Strip and rewind the secondary at WND-1',
          countersign: null,
        },
        cast.lead,
        clock.at(12, 420),
      )
  })
  for (const [k, i] of MISCOUNTED_UNITS.entries()) {
    miscount.run(i, 1, 12, 500 + k * 40, { bench: 'WND-1', turns: 92, isExtra: true })
    for (let p = 2; p <= 6; p++) miscount.run(i, p, 12 + p - 1, 600 + k * 20 + p, { isExtra: true })
  }
  miscount.at(18, 60, async () => {
    await closeLot(miscount.lotId, cast.lead, clock.at(18, 60))
  })
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
  hipot.at(16, 100, async () => {
    await disposeNonconformance(
      hipot.failed.get(5)!,
      {
        disposition: 'scrap',
        reworkToStepId: null,
        reason: 'insulation punctured between primary and secondary; not worth rewinding',
        countersign: null,
      },
      cast.lead,
      clock.at(16, 100),
    )
  })
  hipot.at(16, 820, async () => {
    await disposeNonconformance(
      hipot.failed.get(12)!,
      {
        disposition: 'rework',
        reworkToStepId: hipot.stepAt(3).id,
        reason: 'flux residue across the isolation slot: clean with IPA, dry, test again',
        countersign: null,
      },
      cast.lead,
      clock.at(16, 820),
    )
  })
  for (let p = 3; p <= 6; p++) hipot.run(12, p, 17 + p - 3, 650 + p, { isExtra: true })
  hipot.at(19, 700, async () => {
    await disposeNonconformance(
      hipot.failed.get(16)!,
      {
        disposition: 'use_as_is',
        reworkToStepId: null,
        reason:
          'scuff on the enclosure side, under 5 mm and away from the label; no function affected',
        countersign: null,
      },
      cast.engineer,
      clock.at(19, 700),
    )
  })
  hipot.run(16, 6, 20, 730, { isExtra: true })
  hipot.at(21, 60, async () => {
    await closeLot(hipot.lotId, cast.lead, clock.at(21, 60))
  })
  hipot.atShop(21, 300, async () => {
    await shipLot(
      hipot.lotId,
      {
        customerId: await demoCustomerId('Corrin Instruments'),
        orderRef: DEMO_ORDER_REFS.hipot,
        carrier: 'Tarn Valley Freight',
        tracking: 'TVF 3318 5120 06',
      },
      people,
      clock.at(21, 300),
    )
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
