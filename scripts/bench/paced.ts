// An evenly paced load: the latency a station sees when scans arrive at a given rate.
//
// autocannon's rate option does not spread requests over time: each connection sends as fast as
// it is answered until it has used its share of the second, then waits for the next second. A
// "paced" autocannon run is therefore a burst at full load followed by silence, and its latency
// is the saturation latency. Here request i is due at start + i / rate, whatever happened before,
// and its latency is counted from when it was due, so a slow answer that holds back the requests
// behind it is charged to them too (no coordinated omission).
//
// The requests are sent with undici from a worker thread, so that the client does not delay, on
// the server's own event loop, the very answers it times. It still costs CPU on the second core,
// beside PostgreSQL: the baseline's paced runs used 1.0–1.3 ms of CPU a request in this process
// against 0.5–0.7 ms at saturation (Node's own http client in the worker gave about the same).
// The saturation runs keep autocannon in the server's process, as before: there it loads the
// baseline and the scan alike.
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads'
import { Pool } from 'undici'

export interface PacedRequest {
  url: string
  method: 'GET' | 'POST'
  headers: Record<string, string>
  /** One body per request, in order; null for a GET. */
  bodies: string[] | null
}

export interface PacedResult {
  /** Each request's time from when it was due to its answer, in ms, in the order sent. */
  times: number[]
  /** Wall-clock seconds from the first request's due time to the last answer. */
  seconds: number
  non2xx: number
}

/** Sends `amount` requests due evenly at `rate` per second over at most `connections` sockets. */
async function pace(
  request: PacedRequest,
  rate: number,
  amount: number,
  connections: number,
): Promise<PacedResult> {
  const url = new URL(request.url)
  const pool = new Pool(url.origin, { connections })
  const times: number[] = []
  let non2xx = 0
  let sent = 0
  let answered = 0
  const t0 = performance.now()
  const result = await new Promise<PacedResult>((resolve, reject) => {
    const send = (i: number) => {
      const dueAt = t0 + (i * 1000) / rate
      pool
        .request({
          path: url.pathname,
          method: request.method,
          headers: { ...request.headers, 'content-type': 'application/json' },
          body: request.bodies?.[i],
        })
        .then(async (res) => {
          if (res.statusCode < 200 || res.statusCode > 299) non2xx++
          await res.body.dump()
          const now = performance.now()
          times.push(now - dueAt)
          if (++answered === amount) resolve({ times, seconds: (now - t0) / 1000, non2xx })
        }, reject)
    }
    // A timer every millisecond sends whatever has fallen due since the last one.
    const timer = setInterval(() => {
      const due = Math.min(amount, Math.floor(((performance.now() - t0) * rate) / 1000) + 1)
      for (; sent < due; sent++) send(sent)
      if (sent === amount) clearInterval(timer)
    }, 1)
  })
  await pool.close()
  return result
}

interface Job {
  request: PacedRequest
  rate: number
  amount: number
  connections: number
}

/** A worker thread loaded and ready to send one paced run. */
export interface Pacer {
  run(): Promise<PacedResult>
}

/**
 * Starts a worker thread for one paced run and answers once it has loaded, so that its start-up
 * (compiling this file and undici) is not counted in the run's time or CPU.
 */
export function openPacer(
  request: PacedRequest,
  rate: number,
  amount: number,
  connections: number,
): Promise<Pacer> {
  const job: Job = { request, rate, amount, connections }
  // The worker loads this TypeScript file through tsx's loader, as the script itself was
  // (a worker does not inherit it, and takes no --import of it either).
  const load = `import('tsx/esm/api').then((m) => { m.register(); return import(${JSON.stringify(import.meta.url)}) })`
  const worker = new Worker(load, { eval: true, workerData: job })
  const run = () =>
    new Promise<PacedResult>((resolve, reject) => {
      worker.once('message', (result: PacedResult) => {
        resolve(result)
        void worker.terminate()
      })
      worker.once('error', reject)
      worker.postMessage('go')
    })
  return new Promise((resolve, reject) => {
    worker.once('message', () => resolve({ run }))
    worker.once('error', reject)
  })
}

if (!isMainThread && parentPort) {
  const { request, rate, amount, connections } = workerData as Job
  const port = parentPort
  port.once('message', () => {
    pace(request, rate, amount, connections).then((result) => port.postMessage(result))
  })
  port.postMessage('ready')
}
