import type { CheckDto } from '../../../shared/schemas/recipes'

/**
 * A check of a route step as the API sends it: a plain numeric reading in volts, two decimals,
 * no nominal, limits, choices or derivation, not key, on the certificate, unless `over` gives them.
 */
export function checkDto(over: Partial<CheckDto> = {}): CheckDto {
  return {
    id: 'c',
    stepId: 's',
    position: 1,
    key: 'k',
    label: 'L',
    kind: 'numeric',
    unit: 'V',
    nominal: null,
    lower: null,
    upper: null,
    decimals: 2,
    choices: null,
    derived: null,
    derivedInputs: null,
    isKey: false,
    isForCustomers: true,
    ...over,
  }
}
