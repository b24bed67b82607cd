import { describe, expect, it } from 'vitest'
import { typedValueFields, typedValueProblem } from '../../../../shared/floor/typedValues'

// The Floor's own rules and words (common practice, no source).
const numeric = { kind: 'numeric' as const, choices: null }
const choice = {
  kind: 'choice' as const,
  choices: [
    { value: 'clean', isPass: true },
    { value: 'flux', isPass: false },
  ],
}

describe('typedValueProblem', () => {
  it('counts absent, null, empty and blank values as missing', () => {
    for (const v of [undefined, null, '', '   '])
      expect(typedValueProblem(numeric, v)).toBe('missing')
  })

  it('takes only the check’s kind of value', () => {
    expect(typedValueProblem(numeric, 12.5)).toBeNull()
    expect(typedValueProblem(numeric, '12.5')).toBe('not_number')
    expect(typedValueProblem(numeric, Number.NaN)).toBe('not_number')
    expect(typedValueProblem({ kind: 'boolean', choices: null }, false)).toBeNull()
    expect(typedValueProblem({ kind: 'boolean', choices: null }, 'no')).toBe('not_yes_no')
    expect(typedValueProblem({ kind: 'text', choices: null }, 7)).toBe('not_text')
    expect(typedValueProblem(choice, 'flux')).toBeNull() // a failing choice is still a value
    expect(typedValueProblem(choice, 'shiny')).toBe('not_a_choice')
  })
})

describe('typedValueFields', () => {
  it('names each typed check’s problem in check order, and skips derived checks', () => {
    const checks = [
      { key: 'v', label: 'Output voltage', derived: null, ...numeric },
      { key: 'f', label: 'Finish', derived: null, ...choice },
      { key: 'eff', label: 'Efficiency', derived: 'efficiency' as const, ...numeric },
    ]
    expect(typedValueFields(checks, { f: 'shiny' })).toEqual({
      'values.v': 'enter Output voltage',
      'values.f': 'not one of the choices',
    })
    expect(typedValueFields(checks, { v: 12, f: 'clean' })).toEqual({})
  })
})
