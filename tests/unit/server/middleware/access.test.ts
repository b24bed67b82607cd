import type { NextFunction, Request, Response } from 'express'
import { describe, expect, it } from 'vitest'
import { AppError } from '../../../../server/errors'
import { guard } from '../../../../server/middleware/access'

function run(access: Parameters<typeof guard>[0], user?: { role: string }): unknown {
  let passed: unknown = 'not called'
  const next: NextFunction = (err?: unknown) => {
    passed = err ?? null
  }
  guard(access)({ user } as unknown as Request, {} as Response, next)
  return passed
}

describe('guard', () => {
  it('lets anybody through a public route', () => {
    expect(run('public')).toBeNull()
  })

  it('answers 401 when nobody is signed in', () => {
    expect((run('signed_in') as AppError).status).toBe(401)
    expect((run(['admin']) as AppError).status).toBe(401)
  })

  it('answers 403 for a role not listed and passes a listed one', () => {
    expect((run(['admin', 'lead'], { role: 'operator' }) as AppError).status).toBe(403)
    expect(run(['admin', 'lead'], { role: 'lead' })).toBeNull()
    expect(run('signed_in', { role: 'stores' })).toBeNull()
  })
})
