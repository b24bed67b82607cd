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

type Story = keyof typeof DEMO_ORDER_REFS
type ShopTime = [day: number, minute: number]

/** The revision each lot is built to: the product's released one (demoProducts.ts). */
const RELEASED_LETTER = { FP24: 'B', FP12: 'A' } as const

/** One lot's plan as a row of the table below. */
type PlanRow = [
  story: Story,
  seed: number,
  productCode: Plan['productCode'],
  quantity: number,
  customer: string,
  dueDay: number,
  planned: ShopTime,
  released: ShopTime | null,
  coreLot: string,
]

const PLAN_ROWS: PlanRow[] = [
  ['shipped', 1101, 'FP24', 16, 'Halden Rail Systems', 10, [0, 20], [0, 35], 'HM-26-0419'],
  ['shippedWithOpenReturn', 1202, 'FP12', 12, 'Norvale Labs', 11, [1, 60], [2, 20], 'HM-26-0388'],
  ['miscount', 318, 'FP24', 24, 'Selworth Marine', 19, [7, 300], [8, 30], 'HM-26-0419'],
  ['hipot', 2210, 'FP24', 20, 'Corrin Instruments', 23, [12, 200], [13, 20], 'HM-26-0547'],
  ['contained', 4502, 'FP12', 14, 'Halden Rail Systems', 30, [17, 100], [19, 30], SUSPECT_CORE_LOT],
  ['inProgress', 612, 'FP24', 24, 'Brackwater Energy', 33, [21, 200], [23, 20], 'HM-26-0547'],
  ['inProgressSmall', 137, 'FP12', 10, 'Norvale Labs', 34, [25, 100], [27, 20], 'HM-26-0388'],
  ['planned', 344, 'FP24', 18, 'Selworth Marine', 45, [28, 400], null, 'HM-26-0419'],
]

const at = ([day, minute]: ShopTime) => ({ day, minute })

/** The eight lots' plans, by their part in the story. */
export const LOT_PLANS = Object.fromEntries(
  PLAN_ROWS.map(
    ([story, seed, productCode, quantity, customer, dueDay, planned, released, coreLot]) => [
      story,
      {
        seed,
        productCode,
        letter: RELEASED_LETTER[productCode],
        quantity,
        orderRef: DEMO_ORDER_REFS[story],
        customer,
        dueDay,
        planned: at(planned),
        ...(released ? { released: at(released) } : {}),
        coreLot,
      },
    ],
  ),
) as Record<Story, Plan>

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
