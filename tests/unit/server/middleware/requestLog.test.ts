import express from 'express'
import request from 'supertest'
import { afterEach, describe, expect, it, vi } from 'vitest'
import { logger } from '../../../../server/logger'
import { requestLog } from '../../../../server/middleware/requestLog'

const app = express()
app.use(requestLog)
app.get('/ok', (req, res) => res.json({ id: req.id }))
app.get('/missing', (_req, res) => res.status(404).json({}))
app.get('/broken', (_req, res) => res.status(500).json({}))

describe('requestLog', () => {
  const level = logger.level
  afterEach(() => {
    logger.level = level
    vi.restoreAllMocks()
  })

  it('keeps a sane X-Request-Id, replaces any other, and echoes the id it uses', async () => {
    const kept = await request(app).get('/ok').set('X-Request-Id', 'proxy-1234')
    expect(kept.headers['x-request-id']).toBe('proxy-1234')
    expect(kept.body.id).toBe('proxy-1234')
    const made = await request(app).get('/ok').set('X-Request-Id', 'bad id; drop table')
    expect(made.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/)
    expect(made.body.id).toBe(made.headers['x-request-id'])
  })

  it('logs a success at debug, a refusal at info and a failure at error, with the id', async () => {
    logger.level = 'debug'
    const lines = { debug: vi.spyOn(logger, 'debug'), info: vi.spyOn(logger, 'info') }
    const error = vi.spyOn(logger, 'error')
    await request(app).get('/ok').set('X-Request-Id', 'req-ok-1')
    await request(app).get('/missing').set('X-Request-Id', 'req-404-1')
    await request(app).get('/broken').set('X-Request-Id', 'req-500-1')
    const first = (spy: typeof error) => spy.mock.calls[0]?.[0] as unknown
    expect(first(lines.debug)).toMatchObject({ req: { id: 'req-ok-1', method: 'GET', url: '/ok' } })
    expect(first(lines.info)).toMatchObject({ req: { id: 'req-404-1' }, res: { statusCode: 404 } })
    expect(first(error)).toMatchObject({ req: { id: 'req-500-1' }, res: { statusCode: 500 } })
  })

  it('builds no line for a level that is off', async () => {
    logger.level = 'warn'
    const debug = vi.spyOn(logger, 'debug')
    const info = vi.spyOn(logger, 'info')
    await request(app).get('/ok')
    await request(app).get('/missing')
    expect(debug).not.toHaveBeenCalled()
    expect(info).not.toHaveBeenCalled()
  })
})
