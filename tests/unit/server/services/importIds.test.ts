import { describe, expect, it } from 'vitest'
import { StepRunInput } from '../../../../shared/schemas/lots'
import { importRowEventId, uuidV5 } from '../../../../server/services/imports/importIds'

describe('name-based event ids of imported rows', () => {
  it('computes UUID version 5 as published', () => {
    // Python documentation, module uuid, examples: uuid5(NAMESPACE_DNS, 'python.org').
    expect(uuidV5('python.org', '6ba7b810-9dad-11d1-80b4-00c04fd430c8')).toBe(
      '886313e1-3b8a-5372-9b90-0c9aee199e5d',
    )
  })

  it('gives one id per file content and row, accepted by the step-run schema', () => {
    const sha = 'a'.repeat(64)
    const id = importRowEventId(sha, 2)
    expect(importRowEventId(sha, 2)).toBe(id)
    expect(importRowEventId(sha, 3)).not.toBe(id)
    expect(importRowEventId('b'.repeat(64), 2)).not.toBe(id)
    const parsed = StepRunInput.safeParse({ clientEventId: id, serial: 'X', stationCode: 'LDT-1' })
    expect(parsed.success).toBe(true)
  })
})
