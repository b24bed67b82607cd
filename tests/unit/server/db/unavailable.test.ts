import { ConnectionAcquireTimeoutError, ConnectionRefusedError, DatabaseError } from 'sequelize'
import { describe, expect, it } from 'vitest'
import { isDatabaseUnavailable } from '../../../../server/db/unavailable'

/** An error as node-postgres raises it: a message, and the server's SQLSTATE or a socket code. */
const pgError = (message: string, code?: string) => Object.assign(new Error(message), { code })

// SQLSTATE codes from the PostgreSQL manual, Appendix A "PostgreSQL Error Codes".
describe('isDatabaseUnavailable', () => {
  it('counts a database that is down, restarting or that dropped the connection', () => {
    expect(
      isDatabaseUnavailable(pgError('connect ECONNREFUSED 127.0.0.1:5432', 'ECONNREFUSED')),
    ).toBe(true)
    expect(
      isDatabaseUnavailable(
        pgError('terminating connection due to administrator command', '57P01'),
      ),
    ).toBe(true)
    expect(isDatabaseUnavailable(pgError('the database system is starting up', '57P03'))).toBe(true)
    expect(isDatabaseUnavailable(pgError('connection failure', '08006'))).toBe(true)
    expect(isDatabaseUnavailable(pgError('Connection terminated unexpectedly'))).toBe(true)
    expect(isDatabaseUnavailable(pgError('timeout exceeded when trying to connect'))).toBe(true)
    expect(isDatabaseUnavailable(pgError('Query read timeout'))).toBe(true)
  })

  it('looks inside Sequelize’s wrappers and counts its connection errors', () => {
    const refused = pgError('connect ECONNREFUSED 127.0.0.1:5432', 'ECONNREFUSED')
    expect(isDatabaseUnavailable(new ConnectionRefusedError(refused))).toBe(true)
    expect(isDatabaseUnavailable(new ConnectionAcquireTimeoutError(new Error('timeout')))).toBe(
      true,
    )
    const killed = pgError('terminating connection due to administrator command', '57P01')
    expect(
      isDatabaseUnavailable(new DatabaseError(Object.assign(killed, { sql: 'SELECT 1' }))),
    ).toBe(true)
  })

  it('leaves statement errors and other services’ errors alone', () => {
    expect(isDatabaseUnavailable(pgError('duplicate key value', '23505'))).toBe(false)
    expect(
      isDatabaseUnavailable(pgError('canceling statement due to statement timeout', '57014')),
    ).toBe(false)
    const s3 = Object.assign(pgError('connect ECONNREFUSED', 'ECONNREFUSED'), { $metadata: {} })
    expect(isDatabaseUnavailable(s3)).toBe(false)
    expect(isDatabaseUnavailable(new Error('something else'))).toBe(false)
    expect(isDatabaseUnavailable('a string')).toBe(false)
    expect(isDatabaseUnavailable(null)).toBe(false)
  })
})
