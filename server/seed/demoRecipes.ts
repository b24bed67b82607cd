import type { CheckInput, PartInput, StepInput, WindingInput } from '../../shared/schemas/recipes'
import { HIGH_VOLTAGE_CAUTION } from '../../shared/safety/hipot'

// The invented Ferncastle Power recipes (DESIGN.md §10). Every limit below is invented for the
// demo and chosen to look plausible for such a unit; none comes from a datasheet or standard.

type DemoCheck = Omit<CheckInput, 'derivedInputs'> & { derivedInputs?: Record<string, string> }
export interface DemoStep extends StepInput {
  checks: DemoCheck[]
}
export interface DemoBomLine {
  partNumber: string
  quantity: number
  refDesignators?: string
  fittedAtStep: string
  traceLevel?: 'lot' | 'serial'
}
export interface DemoRevision {
  letter: string
  status: 'released' | 'obsolete'
  notes: string
  windings: WindingInput[]
  steps: DemoStep[]
  bom: DemoBomLine[]
}
export interface DemoProduct {
  code: string
  name: string
  description: string
  revisions: DemoRevision[]
}

export const n = (
  key: string,
  label: string,
  unit: CheckInput['unit'],
  nominal: number | null,
  lower: number | null,
  upper: number | null,
  decimals = 2,
): DemoCheck => ({
  key,
  label,
  kind: 'numeric',
  unit,
  nominal,
  lower,
  upper,
  decimals,
  choices: null,
  derived: null,
})
/** A yes/no check: no unit, nominal or limits. */
const yes = (key: string, label: string): DemoCheck => ({
  ...n(key, label, null, null, null, null, 0),
  kind: 'boolean',
})
/** A check where the operator picks one answer; `isPass` says which answers pass. */
const choice = (
  key: string,
  label: string,
  answers: [value: string, isPass: boolean][],
): DemoCheck => ({
  ...yes(key, label),
  kind: 'choice',
  choices: answers.map(([value, isPass]) => ({ value, isPass })),
})
export const derived = (
  check: DemoCheck,
  formula: NonNullable<CheckInput['derived']>,
  inputs: Record<string, string>,
): DemoCheck => ({
  ...check,
  derived: formula,
  derivedInputs: inputs,
})

/** Nominal, lower and upper limit of a numeric check. */
type Limits = [nominal: number, lower: number, upper: number]

/** The turns counted on each winding: exactly the nominal, or the count is wrong. */
export const turnCounts = (primaryHalf: number, secondary: number): DemoCheck[] => [
  n(
    'primary_a_turns',
    'Primary A turns counted',
    'turns',
    primaryHalf,
    primaryHalf,
    primaryHalf,
    0,
  ),
  n(
    'primary_b_turns',
    'Primary B turns counted',
    'turns',
    primaryHalf,
    primaryHalf,
    primaryHalf,
    0,
  ),
  n('secondary_turns', 'Secondary turns counted', 'turns', secondary, secondary, secondary, 0),
]

/**
 * The ratio test: volts applied to primary A, volts read on the secondary, and the secondary's
 * turns they imply.
 */
export const ratioTest = (applied: Limits, read: Limits, turns: Limits): DemoCheck[] => [
  n('ratio_v_primary', 'Ratio test: volts on primary A', 'V', ...applied, 2),
  n('ratio_v_secondary', 'Ratio test: volts on secondary', 'V', ...read, 1),
  derived(
    n('secondary_turns_ratio', 'Secondary turns from ratio', 'turns', ...turns, 1),
    'secondary_turns_from_ratio',
    {
      primaryWinding: 'primary A',
      primaryVolts: 'ratio_v_primary',
      secondaryVolts: 'ratio_v_secondary',
    },
  ),
]

export const DEMO_PARTS: PartInput[] = [
  {
    partNumber: 'FCS-3000U',
    description: 'Ferrite core set, ungapped, AL 3000 nH/turn²',
    unitOfMeasure: 'set',
    hasExpiry: false,
  },
  {
    partNumber: 'FCS-2200U',
    description: 'Ferrite core set, ungapped, AL 2200 nH/turn²',
    unitOfMeasure: 'set',
    hasExpiry: false,
  },
  {
    partNumber: 'BOB-12P',
    description: 'Coil former, 12 pins',
    unitOfMeasure: 'pcs',
    hasExpiry: false,
  },
  {
    partNumber: 'WCU-140',
    description: 'Enamelled copper wire 1.40 mm, grade 2',
    unitOfMeasure: 'm',
    hasExpiry: false,
  },
  {
    partNumber: 'WCU-045',
    description: 'Enamelled copper wire 0.45 mm, grade 2',
    unitOfMeasure: 'm',
    hasExpiry: false,
  },
  {
    partNumber: 'TPI-25',
    description: 'Polyimide insulation tape 25 mm',
    unitOfMeasure: 'm',
    hasExpiry: true,
    shelfLifeDays: 365,
  },
  {
    partNumber: 'PCB-FP24-B',
    description: 'Main board FP-24350, bare, rev B',
    unitOfMeasure: 'pcs',
    hasExpiry: false,
  },
  {
    partNumber: 'PCB-FP12-A',
    description: 'Main board FP-12150, bare, rev A',
    unitOfMeasure: 'pcs',
    hasExpiry: false,
  },
  {
    partNumber: 'ICP-PWM2',
    description: 'Push-pull PWM controller IC, SOIC-16',
    unitOfMeasure: 'pcs',
    hasExpiry: false,
  },
  {
    partNumber: 'MSF-100V',
    description: 'N-channel MOSFET 100 V, TO-220',
    unitOfMeasure: 'pcs',
    hasExpiry: false,
  },
  {
    partNumber: 'DUF-600V',
    description: 'Ultrafast rectifier diode 600 V 3 A',
    unitOfMeasure: 'pcs',
    hasExpiry: false,
  },
  {
    partNumber: 'CEL-450',
    description: 'Electrolytic capacitor 47 µF 450 V, 105 °C',
    unitOfMeasure: 'pcs',
    hasExpiry: false,
  },
  {
    partNumber: 'SLD-SAC3',
    description: 'Solder wire, lead-free, 0.7 mm',
    unitOfMeasure: 'g',
    hasExpiry: true,
    shelfLifeDays: 730,
  },
  {
    partNumber: 'ENC-AL2',
    description: 'Aluminium enclosure with terminal block',
    unitOfMeasure: 'pcs',
    hasExpiry: false,
  },
]

const hvNote = HIGH_VOLTAGE_CAUTION

export function fp24Steps(): DemoStep[] {
  return [
    {
      name: 'Winding',
      stationKind: 'winding',
      requiresSignoff: false,
      instructions:
        'Wind both primary halves bifilar, 6 turns each, then two layers of tape.\nWind the secondary, 92 turns in four layers, tape between layers.\nCount turns on the counter, measure each winding on the LCR meter at 10 kHz, then apply 10.00 V to primary A and read the secondary.',
      safetyNote: '',
      checks: [
        ...turnCounts(6, 92),
        n('l_primary_a', 'Inductance, primary A', 'µH', 108, 81, 135, 1),
        n('l_primary_b', 'Inductance, primary B', 'µH', 108, 81, 135, 1),
        n('l_secondary', 'Inductance, secondary', 'mH', 25.4, 19.0, 31.8, 2),
        derived(
          n('primary_balance', 'Primary halves balance', '%', 0, -5, 5, 1),
          'winding_balance',
          { inductanceA: 'l_primary_a', inductanceB: 'l_primary_b' },
        ),
        derived(
          n('secondary_turns_est', 'Secondary turns from inductance', 'turns', 92, 80, 104, 1),
          'turns_from_inductance',
          { inductance: 'l_secondary', winding: 'secondary' },
        ),
        derived(
          n('secondary_turn_dev', 'Secondary deviation from inductance', 'turns', 0, -12, 12, 1),
          'turn_deviation',
          { inductance: 'l_secondary', winding: 'secondary' },
        ),
        ...ratioTest([10, 9.9, 10.1], [153.3, 140, 167], [92, 91.5, 92.5]),
        yes('tape_fitted', 'Interlayer tape fitted and smooth'),
      ],
    },
    {
      name: 'Soldering',
      stationKind: 'soldering',
      requiresSignoff: false,
      instructions:
        'Fit the controller, switches, rectifiers and capacitors; fit the transformer last.\nCheck every joint under the magnifier. Observe capacitor polarity.',
      safetyNote: 'Use the fume extractor. Hot iron: park it in its stand.',
      checks: [
        yes('joints_inspected', 'All joints inspected under magnifier'),
        choice('cap_polarity', 'Output capacitor polarity', [
          ['correct', true],
          ['reversed', false],
        ]),
        n('r_secondary', 'Secondary DC resistance', 'Ω', 1.1, 0.8, 1.4, 2),
      ],
    },
    {
      name: 'Hipot',
      stationKind: 'hipot',
      requiresSignoff: true,
      instructions:
        'Short input terminals together and output terminals together.\nApply the test voltage input-to-output for 60 s, ramp 500 V/s.\nRecord the applied voltage, the time held and the highest leakage current.',
      safetyNote: hvNote,
      checks: [
        n('hipot_volts', 'Test voltage applied (AC rms)', 'V', 1700, 1700, 1800, 0),
        n('hipot_seconds', 'Time held', 's', 60, 60, 65, 0),
        n('hipot_leakage', 'Highest leakage current', 'mA', null, null, 5, 2),
        choice('hipot_outcome', 'Outcome', [
          ['no breakdown', true],
          ['breakdown', false],
          ['flashover', false],
        ]),
      ],
    },
    {
      name: 'Load test',
      stationKind: 'load_test',
      requiresSignoff: false,
      instructions:
        'Connect the electronic load at 0.857 A (300 W) and the 24 V supply.\nAfter 10 minutes read input, output and ripple (20 MHz bandwidth), then read the output at no load.',
      safetyNote: hvNote,
      checks: [
        n('vin', 'Input voltage', 'V', 24, 23.5, 24.5, 2),
        n('iin', 'Input current', 'A', 13.9, 0, 15.5, 2),
        n('vout', 'Output voltage, full load', 'V', 350, 345, 355, 1),
        n('iout', 'Output current', 'A', 0.857, 0.84, 0.87, 3),
        n('vout_no_load', 'Output voltage, no load', 'V', 352, 345, 360, 1),
        n('ripple_pp', 'Output ripple, peak to peak', 'V', null, null, 3.5, 2),
        derived(n('efficiency_pct', 'Efficiency', '%', 90, 85, null, 1), 'efficiency', {
          vin: 'vin',
          iin: 'iin',
          vout: 'vout',
          iout: 'iout',
        }),
        derived(n('load_reg_pct', 'Load regulation', '%', null, null, 2, 2), 'load_regulation', {
          vNoLoad: 'vout_no_load',
          vFullLoad: 'vout',
        }),
        derived(n('ripple_pct', 'Ripple, % of output', '%', null, null, 1, 2), 'ripple_percent', {
          ripple: 'ripple_pp',
          vout: 'vout',
        }),
        n('case_temp', 'Case temperature after 10 min', '°C', null, null, 70, 0),
      ],
    },
    {
      name: 'Final inspection',
      stationKind: 'inspection',
      requiresSignoff: false,
      instructions:
        'Check the rating label against the traveler, the enclosure for marks, and that every screw is tight.',
      safetyNote: '',
      checks: [
        yes('label_matches', 'Rating label matches the traveler'),
        yes('cosmetic_ok', 'No marks, dents or loose screws'),
      ],
    },
    {
      name: 'Packing',
      stationKind: 'packing',
      requiresSignoff: false,
      instructions:
        'Bag the unit with a desiccant sachet, box it with the user sheet and seal the box.',
      safetyNote: '',
      checks: [
        yes('packed', 'Bagged with desiccant and boxed'),
        yes('sheet_included', 'User sheet in the box'),
      ],
    },
  ]
}
