import type { LotPlan } from './demoTimeline'

// The plans of the invented Ferncastle Power's eight lots (demoStory.ts tells what happens to
// them). Days are working days of demoClock.ts: 0 is six weeks back, 29 the last before the seed
// ran; minutes count from 06:00.

/** What the tests and the screens may rely on: each story lot's order reference. */
export const DEMO_ORDER_REFS = {
  shipped: 'HRS-4471',
  shippedWithOpenReturn: 'NV-0093',
  miscount: 'SWM-0318',
  hipot: 'CI-2210',
  contained: 'HRS-4502',
  inProgress: 'BWE-0612',
  inProgressSmall: 'NV-0131',
  planned: 'SWM-0344',
} as const

/** The core lot the containment of L-0005 holds. */
export const SUSPECT_CORE_LOT = 'HM-26-0561'

/** L-0003: units 10–15 (0-based) were wound at WND-2 with 94 turns instead of 92. */
export const MISCOUNTED_UNITS = [10, 11, 12, 13, 14, 15]

export type Plan = Omit<LotPlan, 'customerId' | 'customerName' | 'coreAlFactor'> & {
  customer: string
}

/** The eight lots' plans, by their part in the story. */
export const LOT_PLANS: Record<keyof typeof DEMO_ORDER_REFS, Plan> = {
  shipped: {
    seed: 1101,
    productCode: 'FP24',
    letter: 'B',
    quantity: 16,
    orderRef: DEMO_ORDER_REFS.shipped,
    customer: 'Halden Rail Systems',
    dueDay: 10,
    planned: { day: 0, minute: 20 },
    released: { day: 0, minute: 35 },
    coreLot: 'HM-26-0419',
  },
  shippedWithOpenReturn: {
    seed: 1202,
    productCode: 'FP12',
    letter: 'A',
    quantity: 12,
    orderRef: DEMO_ORDER_REFS.shippedWithOpenReturn,
    customer: 'Norvale Labs',
    dueDay: 11,
    planned: { day: 1, minute: 60 },
    released: { day: 2, minute: 20 },
    coreLot: 'HM-26-0388',
  },
  miscount: {
    seed: 318,
    productCode: 'FP24',
    letter: 'B',
    quantity: 24,
    orderRef: DEMO_ORDER_REFS.miscount,
    customer: 'Selworth Marine',
    dueDay: 19,
    planned: { day: 7, minute: 300 },
    released: { day: 8, minute: 30 },
    coreLot: 'HM-26-0419',
  },
  hipot: {
    seed: 2210,
    productCode: 'FP24',
    letter: 'B',
    quantity: 20,
    orderRef: DEMO_ORDER_REFS.hipot,
    customer: 'Corrin Instruments',
    dueDay: 23,
    planned: { day: 12, minute: 200 },
    released: { day: 13, minute: 20 },
    coreLot: 'HM-26-0547',
  },
  contained: {
    seed: 4502,
    productCode: 'FP12',
    letter: 'A',
    quantity: 14,
    orderRef: DEMO_ORDER_REFS.contained,
    customer: 'Halden Rail Systems',
    dueDay: 30,
    planned: { day: 17, minute: 100 },
    released: { day: 19, minute: 30 },
    coreLot: SUSPECT_CORE_LOT,
  },
  inProgress: {
    seed: 612,
    productCode: 'FP24',
    letter: 'B',
    quantity: 24,
    orderRef: DEMO_ORDER_REFS.inProgress,
    customer: 'Brackwater Energy',
    dueDay: 33,
    planned: { day: 21, minute: 200 },
    released: { day: 23, minute: 20 },
    coreLot: 'HM-26-0547',
  },
  inProgressSmall: {
    seed: 137,
    productCode: 'FP12',
    letter: 'A',
    quantity: 10,
    orderRef: DEMO_ORDER_REFS.inProgressSmall,
    customer: 'Norvale Labs',
    dueDay: 34,
    planned: { day: 25, minute: 100 },
    released: { day: 27, minute: 20 },
    coreLot: 'HM-26-0388',
  },
  planned: {
    seed: 344,
    productCode: 'FP24',
    letter: 'B',
    quantity: 18,
    orderRef: DEMO_ORDER_REFS.planned,
    customer: 'Selworth Marine',
    dueDay: 45,
    planned: { day: 28, minute: 400 },
    coreLot: 'HM-26-0419',
  },
}

/**
 * The lots whose story may raise a quality alert: the miscount at WND-2, the hipot lot (its two
 * hipot failures put the step's first-pass yield below the threshold while the lot was built),
 * and the lot wound on the suspect core lot (its inductances sit low). No other lot should have
 * an alert.
 */
export const DEMO_ALERT_LOTS: readonly string[] = [
  DEMO_ORDER_REFS.miscount,
  DEMO_ORDER_REFS.hipot,
  DEMO_ORDER_REFS.contained,
]
