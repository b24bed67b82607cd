import type { FormItemRule } from 'element-plus'
import { describe, expect, it } from 'vitest'
import { StationCreateInput } from '@shared/schemas/stations'
import { UserUpdateInput } from '@shared/schemas/users'
import { useZodRules } from '@/composables/useZodRules'

/** Runs the one rule of `field` the way Element Plus does and returns its message, or null. */
function check(rules: Record<string, unknown>, field: string, value: unknown): string | null {
  const [rule] = rules[field] as FormItemRule[]
  let message: string | null = null
  rule!.validator!(
    rule!,
    value,
    (error?: string | Error) => {
      message = error ? (error instanceof Error ? error.message : error) : null
    },
    {},
    {},
  )
  return message
}

describe('useZodRules', () => {
  const rules = useZodRules(StationCreateInput)

  it('gives the message of the shared schema, as a sentence', () => {
    expect(check(rules, 'code', 'W')).toBe('Use 2 to 16 characters')
    expect(check(rules, 'code', 'wind 2')).toBe('Use letters, digits and hyphens')
    expect(check(rules, 'kind', '')).toBe('Choose a station kind')
  })

  it('accepts what the schema accepts, after its trimming', () => {
    expect(check(rules, 'code', ' wind-02 ')).toBeNull()
    expect(check(rules, 'kind', 'hipot')).toBeNull()
  })

  it('marks required fields and leaves optional ones unmarked', () => {
    expect((rules.name as FormItemRule[])[0]!.required).toBe(true)
    expect((rules.isActive as FormItemRule[])[0]!.required).toBe(false)
  })

  it('treats a blank optional field as not given', () => {
    const updateRules = useZodRules(UserUpdateInput)
    expect(check(updateRules, 'password', '')).toBeNull()
    expect(check(updateRules, 'password', 'short')).toBe('Use at least 10 characters')
  })
})
