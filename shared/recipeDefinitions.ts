// The words a recipe is made of (revision statuses, check kinds, derived formulas, units of
// measure, trace levels): the vocabulary shared/schemas validates with and shared/recipes computes on.
import type { Quantity } from './units'

export const REVISION_STATUSES = ['draft', 'released', 'obsolete'] as const
export type RevisionStatus = (typeof REVISION_STATUSES)[number]

/** Insulation class across the hipot barrier: reinforced doubles the suggested test voltage. */
export const INSULATION_CLASSES = ['basic', 'reinforced'] as const
export type InsulationClass = (typeof INSULATION_CLASSES)[number]

export const CHECK_KINDS = ['numeric', 'boolean', 'text', 'choice'] as const
export type CheckKind = (typeof CHECK_KINDS)[number]

export const TRACE_LEVELS = ['lot', 'serial'] as const
export type TraceLevel = (typeof TRACE_LEVELS)[number]

/** What a derived formula reads: another check of the revision (by key) or a winding (by id). */
export interface FormulaInput {
  name: string
  label: string
  source: 'check' | 'winding'
  /** For check inputs: the quantity the input check's unit must measure. */
  quantity?: Quantity
}

export interface FormulaDefinition {
  label: string
  inputs: readonly FormulaInput[]
  /** The quantity of the result; the derived check's unit must measure it. */
  quantity: Quantity
  description: string
}

/**
 * The fixed list of derived formulas. A derived check names one of these and maps its inputs;
 * there is no free-text formula evaluation anywhere.
 */
export const DERIVED_FORMULAS = {
  turns_from_inductance: {
    label: 'Turns from inductance',
    inputs: [
      { name: 'inductance', label: 'Inductance check', source: 'check', quantity: 'inductance' },
      { name: 'winding', label: 'Winding (its core AL)', source: 'winding' },
    ],
    quantity: 'count',
    description: 'N = √(L / AL): coarse, it carries the core’s AL tolerance',
  },
  turn_deviation: {
    label: 'Turn deviation from nominal',
    inputs: [
      { name: 'inductance', label: 'Inductance check', source: 'check', quantity: 'inductance' },
      { name: 'winding', label: 'Winding (nominal turns, AL)', source: 'winding' },
    ],
    quantity: 'count',
    description: 'N_est − N_nominal, in turns',
  },
  secondary_turns_from_ratio: {
    label: 'Secondary turns from voltage ratio',
    inputs: [
      { name: 'primaryWinding', label: 'Driven winding (its nominal turns)', source: 'winding' },
      {
        name: 'primaryVolts',
        label: 'Voltage applied to it',
        source: 'check',
        quantity: 'voltage',
      },
      {
        name: 'secondaryVolts',
        label: 'Voltage measured on the secondary',
        source: 'check',
        quantity: 'voltage',
      },
    ],
    quantity: 'count',
    description: 'N_s = N_p · V_s / V_p: the precise turn count',
  },
  efficiency: {
    label: 'Efficiency',
    inputs: [
      { name: 'vin', label: 'Input voltage', source: 'check', quantity: 'voltage' },
      { name: 'iin', label: 'Input current', source: 'check', quantity: 'current' },
      { name: 'vout', label: 'Output voltage', source: 'check', quantity: 'voltage' },
      { name: 'iout', label: 'Output current', source: 'check', quantity: 'current' },
    ],
    quantity: 'ratio',
    description: 'P_out / P_in',
  },
  load_regulation: {
    label: 'Load regulation',
    inputs: [
      { name: 'vNoLoad', label: 'Output at no load', source: 'check', quantity: 'voltage' },
      { name: 'vFullLoad', label: 'Output at full load', source: 'check', quantity: 'voltage' },
    ],
    quantity: 'ratio',
    description: '(V_no-load − V_full-load) / V_full-load',
  },
  ripple_percent: {
    label: 'Ripple, % of output',
    inputs: [
      { name: 'ripple', label: 'Ripple, peak to peak', source: 'check', quantity: 'voltage' },
      { name: 'vout', label: 'Output voltage', source: 'check', quantity: 'voltage' },
    ],
    quantity: 'ratio',
    description: 'V_ripple(p-p) / V_out',
  },
  winding_balance: {
    label: 'Balance of two winding halves',
    inputs: [
      {
        name: 'inductanceA',
        label: 'Inductance of half A',
        source: 'check',
        quantity: 'inductance',
      },
      {
        name: 'inductanceB',
        label: 'Inductance of half B',
        source: 'check',
        quantity: 'inductance',
      },
    ],
    quantity: 'ratio',
    description: '(L_A − L_B) / mean(L_A, L_B)',
  },
} as const satisfies Record<string, FormulaDefinition>

export type DerivedFormula = keyof typeof DERIVED_FORMULAS
export const DERIVED_FORMULA_KEYS = Object.keys(DERIVED_FORMULAS) as DerivedFormula[]

/** Part units of measure for the bill of materials. */
export const UNITS_OF_MEASURE = ['pcs', 'm', 'g', 'kg', 'ml', 'set'] as const
export type UnitOfMeasure = (typeof UNITS_OF_MEASURE)[number]

export const COMPONENT_LOT_STATUSES = ['available', 'quarantined', 'used_up', 'rejected'] as const
export type ComponentLotStatus = (typeof COMPONENT_LOT_STATUSES)[number]

/** Next revision letter after the highest one: A → B, Z → AA, AZ → BA. */
export function nextRevisionLetter(letters: readonly string[]): string {
  const toNumber = (s: string) => [...s].reduce((n, ch) => n * 26 + (ch.charCodeAt(0) - 64), 0)
  const highest = letters.reduce((max, l) => Math.max(max, toNumber(l)), 0)
  let n = highest + 1
  let out = ''
  while (n > 0) {
    const r = (n - 1) % 26
    out = String.fromCharCode(65 + r) + out
    n = Math.floor((n - 1) / 26)
  }
  return out
}
