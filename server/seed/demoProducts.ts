import { fp24Steps, n } from './demoRecipes'
import type { DemoProduct, DemoStep } from './demoRecipes'
import { HIGH_VOLTAGE_CAUTION } from '../../shared/safety/hipot'

// The smaller FP-12150 (12 V in, 150 V out, 100 W): 2 × 4 primary turns, 52 secondary turns on
// an AL 2200 nH/turn² core. Invented for the demo, like its limits.
function fp12Steps(): DemoStep[] {
  const [winding, soldering, , , inspection, packing] = fp24Steps()
  return [
    {
      ...winding!,
      instructions:
        'Wind both primary halves bifilar, 4 turns each, tape, then the secondary of 52 turns.\nMeasure at 10 kHz; apply 5.00 V to primary A for the ratio test.',
      checks: [
        n('primary_a_turns', 'Primary A turns counted', 'turns', 4, 4, 4, 0),
        n('primary_b_turns', 'Primary B turns counted', 'turns', 4, 4, 4, 0),
        n('secondary_turns', 'Secondary turns counted', 'turns', 52, 52, 52, 0),
        n('l_secondary', 'Inductance, secondary', 'mH', 5.95, 4.46, 7.44, 2),
        n('ratio_v_primary', 'Ratio test: volts on primary A', 'V', 5, 4.95, 5.05, 2),
        n('ratio_v_secondary', 'Ratio test: volts on secondary', 'V', 65, 60, 70, 1),
        {
          ...n('secondary_turns_ratio', 'Secondary turns from ratio', 'turns', 52, 51.5, 52.5, 1),
          derived: 'secondary_turns_from_ratio',
          derivedInputs: {
            primaryWinding: 'primary A',
            primaryVolts: 'ratio_v_primary',
            secondaryVolts: 'ratio_v_secondary',
          },
        },
      ],
    },
    { ...soldering!, checks: soldering!.checks.filter((c) => c.key !== 'r_secondary') },
    {
      name: 'Hipot',
      stationKind: 'hipot',
      requiresSignoff: true,
      instructions:
        'Input shorted, output shorted. Apply the test voltage input-to-output for 60 s.',
      safetyNote: HIGH_VOLTAGE_CAUTION,
      checks: [
        n('hipot_volts', 'Test voltage applied (AC rms)', 'V', 1500, 1500, 1600, 0),
        n('hipot_seconds', 'Time held', 's', 60, 60, 65, 0),
        n('hipot_leakage', 'Highest leakage current', 'mA', null, null, 5, 2),
      ],
    },
    {
      name: 'Load test',
      stationKind: 'load_test',
      requiresSignoff: false,
      instructions: 'Load at 0.667 A (100 W) from a 12 V supply; read after 10 minutes.',
      safetyNote: HIGH_VOLTAGE_CAUTION,
      checks: [
        n('vin', 'Input voltage', 'V', 12, 11.8, 12.2, 2),
        n('iin', 'Input current', 'A', 9.3, 0, 10.5, 2),
        n('vout', 'Output voltage, full load', 'V', 150, 147, 153, 1),
        n('iout', 'Output current', 'A', 0.667, 0.65, 0.68, 3),
        {
          ...n('efficiency_pct', 'Efficiency', '%', 89, 84, null, 1),
          derived: 'efficiency',
          derivedInputs: { vin: 'vin', iin: 'iin', vout: 'vout', iout: 'iout' },
        },
      ],
    },
    inspection!,
    packing!,
  ]
}

const FP24_WINDINGS = [
  {
    name: 'primary A',
    nominalTurns: 6,
    alNanoHenry: 3000,
    alTolerancePercent: 25,
    coreAreaMm2: 178,
  },
  {
    name: 'primary B',
    nominalTurns: 6,
    alNanoHenry: 3000,
    alTolerancePercent: 25,
    coreAreaMm2: 178,
  },
  {
    name: 'secondary',
    nominalTurns: 92,
    alNanoHenry: 3000,
    alTolerancePercent: 25,
    coreAreaMm2: 178,
  },
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
          {
            partNumber: 'PCB-FP24-B',
            quantity: 1,
            fittedAtStep: 'Soldering',
            traceLevel: 'serial',
          },
          { partNumber: 'ICP-PWM2', quantity: 1, refDesignators: 'U1', fittedAtStep: 'Soldering' },
          {
            partNumber: 'MSF-100V',
            quantity: 2,
            refDesignators: 'Q1, Q2',
            fittedAtStep: 'Soldering',
          },
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
        windings: [
          {
            name: 'primary A',
            nominalTurns: 4,
            alNanoHenry: 2200,
            alTolerancePercent: 25,
            coreAreaMm2: 97,
          },
          {
            name: 'primary B',
            nominalTurns: 4,
            alNanoHenry: 2200,
            alTolerancePercent: 25,
            coreAreaMm2: 97,
          },
          {
            name: 'secondary',
            nominalTurns: 52,
            alNanoHenry: 2200,
            alTolerancePercent: 25,
            coreAreaMm2: 97,
          },
        ],
        steps: fp12Steps(),
        bom: [
          { partNumber: 'FCS-2200U', quantity: 1, fittedAtStep: 'Winding' },
          { partNumber: 'WCU-140', quantity: 0.8, fittedAtStep: 'Winding' },
          { partNumber: 'WCU-045', quantity: 4.5, fittedAtStep: 'Winding' },
          {
            partNumber: 'PCB-FP12-A',
            quantity: 1,
            fittedAtStep: 'Soldering',
            traceLevel: 'serial',
          },
          { partNumber: 'ICP-PWM2', quantity: 1, refDesignators: 'U1', fittedAtStep: 'Soldering' },
          {
            partNumber: 'MSF-100V',
            quantity: 2,
            refDesignators: 'Q1, Q2',
            fittedAtStep: 'Soldering',
          },
        ],
      },
    ],
  },
]
