import { once } from 'node:events'
import type { AddressInfo } from 'node:net'
import { buildApp } from '../../../server/main/app'
import { closeSessionPool } from '../../../server/middleware/session'
import { closeDb } from '../../../server/models'
import { closeRedis } from '../../../server/redis'

export interface AppServer {
  /** e.g. `http://127.0.0.1:40123`, without a trailing slash. */
  baseUrl: string
  close(): Promise<void>
}

/**
 * Starts the whole app in this process on a free loopback port: the API plus the built client
 * from dist/ (the test runner builds it first). No workers run; these tests need none.
 */
export async function startAppServer(): Promise<AppServer> {
  const app = buildApp()
  const server = app.listen(0, '127.0.0.1')
  await once(server, 'listening')
  const { port } = server.address() as AddressInfo
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    async close() {
      server.closeAllConnections()
      await new Promise<void>((resolve) => server.close(() => resolve()))
      await Promise.allSettled([closeDb(), closeSessionPool(), closeRedis()])
    },
  }
}
