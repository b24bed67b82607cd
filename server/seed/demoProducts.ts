import { derived, fp24Steps, n, ratioTest, turnCounts } from './demoRecipes'
import type { DemoBomLine, DemoProduct, DemoStep } from './demoRecipes'
import type { WindingInput } from '../../shared/schemas/recipes'

// The smaller FP-12150 (12 V in, 150 V out, 100 W): 2 × 4 primary turns, 52 secondary turns on
// an AL 2200 nH/turn² core. Invented for the demo, like its limits.
function fp12Steps(): DemoStep[] {
  const [winding, soldering, hipot, loadTest, inspection, packing] = fp24Steps()
  const [, heldSeconds, leakage] = hipot!.checks
  return [
    {
      ...winding!,
      instructions:
        'Wind both primary halves bifilar, 4 turns each, tape, then the secondary of 52 turns.\nMeasure at 10 kHz; apply 5.00 V to primary A for the ratio test.',
      checks: [
        ...turnCounts(4, 52),
        n('l_secondary', 'Inductance, secondary', 'mH', 5.95, 4.46, 7.44, 2),
        ...ratioTest([5, 4.95, 5.05], [65, 60, 70], [52, 51.5, 52.5]),
      ],
    },
    { ...soldering!, checks: soldering!.checks.filter((c) => c.key !== 'r_secondary') },
    {
      ...hipot!,
      instructions:
        'Input shorted, output shorted. Apply the test voltage input-to-output for 60 s.',
      checks: [
        n('hipot_volts', 'Test voltage applied (AC rms)', 'V', 1500, 1500, 1600, 0),
        heldSeconds!,
        leakage!,
      ],
    },
    {
      ...loadTest!,
      instructions: 'Load at 0.667 A (100 W) from a 12 V supply; read after 10 minutes.',
      checks: [
        n('vin', 'Input voltage', 'V', 12, 11.8, 12.2, 2),
        n('iin', 'Input current', 'A', 9.3, 0, 10.5, 2),
        n('vout', 'Output voltage, full load', 'V', 150, 147, 153, 1),
        n('iout', 'Output current', 'A', 0.667, 0.65, 0.68, 3),
        derived(n('efficiency_pct', 'Efficiency', '%', 89, 84, null, 1), 'efficiency', {
          vin: 'vin',
          iin: 'iin',
          vout: 'vout',
          iout: 'iout',
        }),
      ],
    },
    inspection!,
    packing!,
  ]
}

/** A product's windings on one core: two equal primary halves, then the secondary. */
const windings = (
  primaryTurns: number,
  secondaryTurns: number,
  alNanoHenry: number,
  coreAreaMm2: number,
): WindingInput[] =>
  (
    [
      ['primary A', primaryTurns],
      ['primary B', primaryTurns],
      ['secondary', secondaryTurns],
    ] as const
  ).map(([name, nominalTurns]) => ({
    name,
    nominalTurns,
    alNanoHenry,
    alTolerancePercent: 25,
    coreAreaMm2,
  }))

const FP24_WINDINGS = windings(6, 92, 3000, 178)

/** Both products fit a main board (traced by serial), the same controller and the same switches. */
const boardParts = (board: string): DemoBomLine[] => [
  { partNumber: board, quantity: 1, fittedAtStep: 'Soldering', traceLevel: 'serial' },
  { partNumber: 'ICP-PWM2', quantity: 1, refDesignators: 'U1', fittedAtStep: 'Soldering' },
  { partNumber: 'MSF-100V', quantity: 2, refDesignators: 'Q1, Q2', fittedAtStep: 'Soldering' },
]

export const DEMO_PRODUCTS: DemoProduct[] = [
  {
    code: 'FP24',
    name: 'FP-24350 isolated converter, 24 V to 350 V, 300 W',
    description:
      'Push-pull isolated DC-DC converter with a centre-tapped primary (2 × 6 turns) and a 92-turn secondary on an ungapped ferrite core.',
    revisions: [
      {
        letter: 'A',
        status: 'obsolete',
        notes:
          'First build; replaced by B (secondary re-wound in four layers). Demo data: every limit is invented.',
        windings: FP24_WINDINGS,
        steps: fp24Steps().slice(0, 1),
        bom: [],
      },
      {
        letter: 'B',
        status: 'released',
        notes:
          'Secondary in four layers with interlayer tape. Demo data: every limit is invented for this example shop, not taken from a datasheet or standard.',
        windings: FP24_WINDINGS,
        steps: fp24Steps(),
        bom: [
          { partNumber: 'FCS-3000U', quantity: 1, fittedAtStep: 'Winding' },
          { partNumber: 'BOB-12P', quantity: 1, fittedAtStep: 'Winding' },
          { partNumber: 'WCU-140', quantity: 1.2, fittedAtStep: 'Winding' },
          { partNumber: 'WCU-045', quantity: 9.5, fittedAtStep: 'Winding' },
          { partNumber: 'TPI-25', quantity: 0.6, fittedAtStep: 'Winding' },
          ...boardParts('PCB-FP24-B'),
          {
            partNumber: 'DUF-600V',
            quantity: 4,
            refDesignators: 'D1-D4',
            fittedAtStep: 'Soldering',
          },
          {
            partNumber: 'CEL-450',
            quantity: 2,
            refDesignators: 'C10, C11',
            fittedAtStep: 'Soldering',
          },
          { partNumber: 'SLD-SAC3', quantity: 6, fittedAtStep: 'Soldering' },
          { partNumber: 'ENC-AL2', quantity: 1, fittedAtStep: 'Final inspection' },
        ],
      },
    ],
  },
  {
    code: 'FP12',
    name: 'FP-12150 isolated converter, 12 V to 150 V, 100 W',
    description:
      'Smaller push-pull converter: 2 × 4 primary turns, 52-turn secondary, ungapped ferrite core.',
    revisions: [
      {
        letter: 'A',
        status: 'released',
        notes: 'First release. Demo data: every limit is invented for this example shop.',
        windings: windings(4, 52, 2200, 97),
        steps: fp12Steps(),
        bom: [
          { partNumber: 'FCS-2200U', quantity: 1, fittedAtStep: 'Winding' },
          { partNumber: 'WCU-140', quantity: 0.8, fittedAtStep: 'Winding' },
          { partNumber: 'WCU-045', quantity: 4.5, fittedAtStep: 'Winding' },
          ...boardParts('PCB-FP12-A'),
        ],
      },
    ],
  },
]
