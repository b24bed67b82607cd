import { describe, expect, it } from 'vitest'
import { z } from 'zod'
import { scanText, text, textProblem } from '../../../../shared/schemas/common'
import { StepRunInput } from '../../../../shared/schemas/lots'
import { CustomerCreateInput } from '../../../../shared/schemas/shipping'

const issues = (schema: z.ZodType, input: unknown) => {
  const r = schema.safeParse(input)
  return r.success ? [] : r.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`)
}

describe('the shared text helper', () => {
  it('names a NUL and a lone surrogate, and passes well-formed text', () => {
    expect(textProblem('A\u0000B')).toMatch(/NUL/)
    expect(textProblem('A\uD800')).toMatch(/surrogate/)
    expect(textProblem('\uDC00A')).toMatch(/surrogate/)
    // A surrogate pair is one character (U+1F50C, an electric plug), not a broken one.
    expect(textProblem('plug \uD83D\uDD0C')).toBeNull()
    expect(textProblem('Ω µ ° ±')).toBeNull()
  })

  it('refuses them wherever a schema takes a string, and chains like z.string()', () => {
    const s = z.object({ name: text().trim().min(2).max(5), tags: z.record(text(), z.number()) })
    expect(issues(s, { name: ' ab ', tags: { a: 1 } })).toEqual([])
    expect(issues(s, { name: 'a\u0000b', tags: {} })).toEqual([
      'name: must not contain a NUL character',
    ])
    expect(issues(s, { name: 'ab', tags: { ['\uD800']: 1 } })).toHaveLength(1)
    expect(issues(CustomerCreateInput, { name: 'Acme \uDFFF' })).toEqual([
      'name: must not contain a broken character (a lone surrogate)',
    ])
  })

  it('reads scan text as a code, or says what it is not', () => {
    const serial = scanText('serial', 'scan a serial')
    expect(issues(serial, 'http://host/u/FP24-2649-00017K')).toEqual([])
    expect(issues(serial, 'ZZ%')).toEqual([': not a serial'])
    expect(issues(serial, '  ')).toEqual([': scan a serial'])
    const run = { clientEventId: crypto.randomUUID(), serial: '50%OFF', stationCode: 'WND-1' }
    expect(issues(StepRunInput, run)).toEqual(['serial: not a serial'])
  })
})
