import { describe, expect, it } from 'vitest'
import { releaseProblems } from '../../../../shared/recipes/completeness'
import { nextRevisionLetter } from '../../../../shared/recipeDefinitions'
import { checkLimitProblems } from '../../../../shared/checkRules'
import type { CheckDto, StepDto } from '../../../../shared/schemas/recipes'

const baseCheck: CheckDto = {
  id: 'c',
  stepId: 's',
  position: 1,
  key: 'v',
  label: 'V',
  kind: 'numeric',
  unit: 'V',
  nominal: 10,
  lower: 9,
  upper: 11,
  decimals: 2,
  choices: null,
  derived: null,
  derivedInputs: null,
  isKey: false,
  isForCustomers: true,
}
const step = (checks: CheckDto[]): StepDto => ({
  id: 's',
  position: 1,
  name: 'Load test',
  stationKind: 'load_test',
  instructions: '',
  safetyNote: '',
  requiresSignoff: false,
  checks,
})

describe('releaseProblems', () => {
  it('is empty for a complete revision', () => {
    expect(releaseProblems({ steps: [step([baseCheck])], bom: [], windings: [] })).toEqual([])
  })

  it('names a route without steps, a numeric check without unit or limits, and an unplaced part', () => {
    expect(releaseProblems({ steps: [], bom: [], windings: [] })).toEqual([
      'the route has no steps',
    ])
    const problems = releaseProblems({
      steps: [step([{ ...baseCheck, unit: null, lower: null, upper: null }])],
      bom: [
        {
          id: 'b',
          partId: 'p',
          partNumber: 'PCB-1',
          partDescription: '',
          unitOfMeasure: 'pcs',
          quantity: 1,
          refDesignators: '',
          fittedAtStepId: null,
          traceLevel: 'lot',
        },
      ],
      windings: [],
    })
    expect(problems).toEqual([
      'step 1 "Load test", check v: choose a unit',
      'step 1 "Load test", check v: give at least one limit',
      'bill of materials, PCB-1: choose the step where it is fitted',
    ])
  })

  it('requires a derived check to read typed checks of its step with the right quantity', () => {
    const ripple: CheckDto = {
      ...baseCheck,
      key: 'r',
      unit: '%',
      derived: 'ripple_percent',
      derivedInputs: { ripple: 'v', vout: 'missing' },
    }
    const problems = releaseProblems({ steps: [step([baseCheck, ripple])], bom: [], windings: [] })
    expect(problems).toEqual([
      'step 1 "Load test", check r: choose a typed check of this step for "Output voltage"',
    ])
  })
})

describe('checkLimitProblems', () => {
  it('names the lower limit when it exceeds the upper', () => {
    expect(checkLimitProblems({ ...baseCheck, lower: 12, upper: 11, nominal: null })).toEqual([
      { field: 'lower', message: 'the lower limit must not exceed the upper limit' },
    ])
  })
})

describe('nextRevisionLetter', () => {
  it('counts A, B … Z, AA, AB', () => {
    expect(nextRevisionLetter([])).toBe('A')
    expect(nextRevisionLetter(['A', 'C', 'B'])).toBe('D')
    expect(nextRevisionLetter(['Z'])).toBe('AA')
    expect(nextRevisionLetter(['AZ'])).toBe('BA')
  })
})

describe('patch schemas', () => {
  it('leave out what a PATCH does not name instead of filling in defaults', async () => {
    const { CheckUpdateInput, StepUpdateInput } = await import('../../../../shared/schemas/recipes')
    expect(CheckUpdateInput.parse({ upper: 5 })).toEqual({ upper: 5 })
    expect(StepUpdateInput.parse({ name: 'Soldering' })).toEqual({ name: 'Soldering' })
  })
})
