import request from 'supertest'
import { describe, expect, it } from 'vitest'
import { testApp } from './support/client'

describe('health and error shape', () => {
  it('reports every part up', async () => {
    const res = await request(testApp()).get('/api/health')
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ status: 'ok', db: 'ok', redis: 'ok', storage: 'ok' })
    expect(res.body.version).toMatch(/^\d+\.\d+\.\d+/)
  })

  it('answers an unknown API path with a JSON 404 and a request id', async () => {
    const res = await request(testApp()).get('/api/no-such-thing')
    expect(res.status).toBe(404)
    expect(res.body.error).toBe('not_found')
    expect(res.headers['x-request-id']).toMatch(/^[\w-]{8,}$/)
  })

  it('answers malformed JSON with a 400 and no stack trace', async () => {
    const agent = request.agent(testApp())
    const { body } = await agent.get('/api/auth/csrf')
    const res = await agent
      .post('/api/auth/login')
      .set('X-CSRF-Token', body.csrfToken)
      .set('Content-Type', 'application/json')
      .send('{"email": ')
    expect(res.status).toBe(400)
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts:\d+/)
  })

  it('answers a body over 1 MB with 413', async () => {
    const agent = request.agent(testApp())
    const { body } = await agent.get('/api/auth/csrf')
    const res = await agent
      .post('/api/auth/login')
      .set('X-CSRF-Token', body.csrfToken)
      .send({ email: 'a@b.c', password: 'x'.repeat(1_100_000) })
    expect(res.status).toBe(413)
    expect(res.body.error).toBe('too_large')
  })

  it('sends the security headers helmet sets', async () => {
    const res = await request(testApp()).get('/api/health')
    expect(res.headers['x-content-type-options']).toBe('nosniff')
    expect(res.headers['content-security-policy']).toContain("default-src 'self'")
    expect(res.headers['x-powered-by']).toBeUndefined()
  })
})
