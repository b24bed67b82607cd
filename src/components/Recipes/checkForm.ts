import type { CheckKind, DerivedFormula } from '@shared/recipeDefinitions'
import type { CheckDto, CheckInput, ChoiceOption } from '@shared/schemas/recipes'
import { UNIT_SYMBOLS, UNITS } from '@shared/units'
import type { Quantity, Unit } from '@shared/units'

/** The check dialog's model: every field always present, blanks as null. */
export interface CheckForm {
  key: string
  label: string
  kind: CheckKind
  unit: Unit | null
  nominal: number | null
  lower: number | null
  upper: number | null
  decimals: number
  choices: ChoiceOption[]
  derived: DerivedFormula | null
  derivedInputs: Record<string, string>
  isKey: boolean
  /** null: the default for its unit and formula (turn counts off the certificate). */
  isForCustomers: boolean | null
}

export const CHECK_KIND_LABELS: Record<CheckKind, string> = {
  numeric: 'Number',
  boolean: 'Yes / no',
  text: 'Text',
  choice: 'Choice',
}

export function emptyCheckForm(): CheckForm {
  return {
    key: '',
    label: '',
    kind: 'numeric',
    unit: null,
    nominal: null,
    lower: null,
    upper: null,
    decimals: 2,
    choices: [],
    derived: null,
    derivedInputs: {},
    isKey: false,
    isForCustomers: null,
  }
}

export function checkFormOf(c: CheckDto): CheckForm {
  const { key, label, kind, unit, nominal, lower, upper, decimals, derived } = c
  return {
    key,
    label,
    kind,
    unit,
    nominal,
    lower,
    upper,
    decimals,
    derived,
    choices: c.choices?.map((o) => ({ ...o })) ?? [],
    derivedInputs: { ...(c.derivedInputs ?? {}) },
    isKey: c.isKey,
    isForCustomers: c.isForCustomers,
  }
}

/** The input to send: fields that do not belong to the kind are cleared, as the server expects. */
export function checkInputOf(form: CheckForm): CheckInput {
  const isNumeric = form.kind === 'numeric'
  return {
    key: form.key.trim(),
    label: form.label.trim(),
    kind: form.kind,
    unit: isNumeric ? form.unit : null,
    nominal: isNumeric ? form.nominal : null,
    lower: isNumeric ? form.lower : null,
    upper: isNumeric ? form.upper : null,
    decimals: form.decimals,
    choices:
      form.kind === 'choice'
        ? form.choices.map((o) => ({ value: o.value.trim(), isPass: o.isPass }))
        : null,
    derived: isNumeric ? form.derived : null,
    derivedInputs: isNumeric && form.derived ? { ...form.derivedInputs } : null,
    isKey: isNumeric && form.isKey,
    ...(form.isForCustomers === null ? {} : { isForCustomers: form.isForCustomers }),
  }
}

const QUANTITY_LABELS: Record<Quantity, string> = {
  voltage: 'Voltage',
  current: 'Current',
  power: 'Power',
  resistance: 'Resistance',
  inductance: 'Inductance',
  frequency: 'Frequency',
  time: 'Time',
  ratio: 'Ratio',
  temperature: 'Temperature',
  count: 'Count',
}

/** Unit options grouped by quantity; only the formula's quantity when the check is derived. */
export function unitGroups(only: Quantity | null) {
  const groups = new Map<Quantity, Unit[]>()
  for (const unit of UNIT_SYMBOLS) {
    const quantity = UNITS[unit].quantity
    if (only && quantity !== only) continue
    groups.set(quantity, [...(groups.get(quantity) ?? []), unit])
  }
  return [...groups].map(([quantity, units]) => ({ label: QUANTITY_LABELS[quantity], units }))
}
