import { describe, expect, it } from 'vitest'
import { limitText, plainNumber } from '../../../../shared/recipes/limitText'
import type { Limits } from '../../../../shared/recipes/limitText'

// The wordings are house style (common practice, no source); each expectation below is the
// text a screen or document showed before the wordings met in one table.
const inductance: Limits = { lower: 81, upper: 135, unit: 'µH', decimals: 1, nominal: 108 }
const limits = (over: Partial<Limits>): Limits => ({ ...inductance, nominal: null, ...over })

describe('limitText on paper', () => {
  it('joins limits with an en dash, adds the nominal and drops padding zeros', () => {
    expect(limitText(inductance, 'paper')).toBe('81–135 µH (nom. 108)')
    expect(limitText(limits({ lower: 85, upper: null, unit: '%' }), 'paper')).toBe('min 85 %')
    expect(limitText(limits({ lower: null, upper: 5, unit: 'mA' }), 'paper')).toBe('max 5 mA')
  })

  it('writes "to" between negative limits and "exactly" for equal ones', () => {
    expect(limitText(limits({ lower: -0.5, upper: 0.5, unit: 'turns' }), 'paper')).toBe(
      '−0.5 to 0.5 turns',
    )
    expect(limitText(limits({ lower: 92, upper: 92, unit: 'turns' }), 'paper')).toBe(
      'exactly 92 turns',
    )
  })

  it('asks for a recording when there are no limits', () => {
    expect(limitText(limits({ lower: null, upper: null, unit: 'V', nominal: 350 }), 'paper')).toBe(
      'record, in V (nom. 350)',
    )
    expect(limitText(limits({ lower: null, upper: null, unit: null }), 'paper')).toBe(
      'record the value',
    )
  })
})

describe('limitText on the Trace screen', () => {
  it('leaves the nominal out unless it is all there is', () => {
    expect(limitText(inductance, 'trace')).toBe('81–135 µH')
    expect(limitText(limits({ lower: null, upper: 5, unit: 'mA' }), 'trace')).toBe('max 5 mA')
    expect(limitText(limits({ lower: null, upper: null, nominal: 24 }), 'trace')).toBe('nom. 24 µH')
    expect(limitText(limits({ lower: null, upper: null }), 'trace')).toBe('—')
  })
})

describe('limitText at the bench', () => {
  it('writes both limits with a dash and no padding zeros', () => {
    expect(limitText(inductance, 'bench')).toBe('81 – 135 µH')
    expect(limitText(limits({ lower: 9.9, upper: 10.1, unit: 'V', decimals: 2 }), 'bench')).toBe(
      '9.9 – 10.1 V',
    )
  })

  it('writes an exact count, a floor and a ceiling', () => {
    expect(limitText(limits({ lower: 6, upper: 6, unit: 'turns', decimals: 0 }), 'bench')).toBe(
      '= 6 turns',
    )
    expect(limitText(limits({ lower: 85, upper: null, unit: '%' }), 'bench')).toBe('≥ 85 %')
    expect(limitText(limits({ lower: null, upper: 5, unit: 'mA' }), 'bench')).toBe('≤ 5 mA')
    expect(limitText(limits({ lower: null, upper: null }), 'bench')).toBe('')
  })
})

describe('limitText in the recipe editor', () => {
  it('shows the check decimals and says when there are no limits', () => {
    expect(limitText(limits({ lower: 11.4, upper: 12.6, decimals: 2 }), 'recipe')).toBe(
      '11.40 to 12.60 µH',
    )
    expect(limitText(limits({ lower: 6, upper: 6, unit: 'turns', decimals: 0 }), 'recipe')).toBe(
      'exactly 6 turns',
    )
    expect(limitText(limits({ lower: 11.4, upper: null, decimals: 2 }), 'recipe')).toBe(
      'at least 11.40 µH',
    )
    expect(limitText(limits({ lower: null, upper: null }), 'recipe')).toBe('no limits')
  })
})

describe('limitText for an imported row', () => {
  it('keeps the numbers as given and leaves the unit to the value', () => {
    expect(limitText({ lower: 0.5, upper: 1.5 }, 'import')).toBe('0.5 to 1.5')
    expect(limitText({ lower: null, upper: 3 }, 'import')).toBe('at most 3')
    expect(limitText({ lower: null, upper: null }, 'import')).toBe('')
  })
})

describe('plainNumber', () => {
  it('drops padding zeros and never groups thousands', () => {
    expect(plainNumber(0.8571, 3)).toBe('0.857')
    expect(plainNumber(12000, 1)).toBe('12000')
  })
})
