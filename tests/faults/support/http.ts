import { DEMO_PASSWORD } from '../../../server/seed/demoUsers'

export interface Reply {
  status: number
  // A JSON body as the API sends it; the tests read the fields they need.
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- JSON of many shapes
  body: any
  ms: number
}

/** Status 0: no answer at all within the client's limit (a hang), or the connection failed. */
export const NO_ANSWER = 0

/**
 * A browser-like client of a running API over real HTTP: keeps the session cookie and sends the
 * CSRF token, as the Floor's tablets do. Each request gives up after `timeoutMs`.
 */
export class HttpClient {
  private cookie = ''
  private csrf = ''

  constructor(
    readonly baseUrl: string,
    private readonly timeoutMs = 15_000,
  ) {}

  async request(method: string, path: string, body?: unknown): Promise<Reply> {
    const started = performance.now()
    const headers: Record<string, string> = { accept: 'application/json' }
    if (this.cookie) headers.cookie = this.cookie
    if (method !== 'GET') headers['x-csrf-token'] = this.csrf
    if (body !== undefined) headers['content-type'] = 'application/json'
    try {
      const res = await fetch(`${this.baseUrl}${path}`, {
        method,
        headers,
        body: body === undefined ? undefined : JSON.stringify(body),
        signal: AbortSignal.timeout(this.timeoutMs),
      })
      const setCookie = res.headers.getSetCookie().find((c) => c.startsWith('waymark.sid='))
      if (setCookie) this.cookie = setCookie.split(';')[0]!
      const text = await res.text()
      let parsed: unknown = text
      try {
        parsed = text ? JSON.parse(text) : null
      } catch {
        // not JSON: keep the text for the failure message
      }
      return { status: res.status, body: parsed, ms: performance.now() - started }
    } catch (err) {
      return { status: NO_ANSWER, body: String(err), ms: performance.now() - started }
    }
  }

  get(path: string): Promise<Reply> {
    return this.request('GET', path)
  }

  post(path: string, body?: unknown): Promise<Reply> {
    return this.request('POST', path, body)
  }

  /** Like `post`, but throws unless the status is `expected`: for a test's own setup steps. */
  async must(method: string, path: string, body: unknown, expected: number): Promise<Reply> {
    const reply = await this.request(method, path, body)
    if (reply.status !== expected)
      throw new Error(
        `${method} ${path}: expected ${expected}, got ${reply.status} ${JSON.stringify(reply.body)}`,
      )
    return reply
  }

  async signIn(role: string): Promise<this> {
    this.csrf = (await this.must('GET', '/api/auth/csrf', undefined, 200)).body.csrfToken
    await this.must(
      'POST',
      '/api/auth/login',
      { email: `${role}@ferncastle.example`, password: DEMO_PASSWORD },
      200,
    )
    // Signing in makes a new session: fetch its token.
    this.csrf = (await this.must('GET', '/api/auth/csrf', undefined, 200)).body.csrfToken
    return this
  }
}

/** A client of `baseUrl` signed in as the demo user of `role`. */
export function signedIn(baseUrl: string, role: string): Promise<HttpClient> {
  return new HttpClient(baseUrl).signIn(role)
}
