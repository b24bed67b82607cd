/** How many batches may run at once, and how many calls one batch takes at most. */
export interface CoalesceOptions {
  maxInFlight?: number
  maxBatch?: number
}

interface Waiting<In, Out> {
  item: In
  resolve: (out: Out) => void
  reject: (err: unknown) => void
}

/**
 * Turns a function of many inputs (one answer per input, in order) into a function of one input
 * whose concurrent calls share a batch. A call made while fewer than `maxInFlight` batches run
 * goes out at the end of the current turn of the event loop, with whatever else arrived in that
 * turn; a call made while the limit is reached waits and goes with the next batch, together with
 * everything that queued meanwhile. So one call alone costs what it always did, and under load N
 * callers share one round trip to the database instead of making N.
 *
 * A batch of several that fails is run again one input at a time, so that each caller gets its
 * own answer or its own error: `run` must therefore be atomic (a statement, or a transaction)
 * and safe to repeat after a failure.
 */
export function coalesce<In, Out>(
  run: (items: In[]) => Promise<Out[]>,
  { maxInFlight = 2, maxBatch = 64 }: CoalesceOptions = {},
): (item: In) => Promise<Out> {
  const queue: Waiting<In, Out>[] = []
  let inFlight = 0
  let isScheduled = false

  async function settle(batch: Waiting<In, Out>[]): Promise<void> {
    try {
      const outs = await run(batch.map((w) => w.item))
      batch.forEach((w, i) => w.resolve(outs[i]!))
    } catch (err) {
      if (batch.length === 1) batch[0]!.reject(err)
      else await Promise.all(batch.map((w) => settle([w])))
    }
  }

  function pump(): void {
    isScheduled = false
    while (inFlight < maxInFlight && queue.length > 0) {
      inFlight++
      void settle(queue.splice(0, maxBatch)).finally(() => {
        inFlight--
        schedule()
      })
    }
  }

  function schedule(): void {
    if (isScheduled || queue.length === 0 || inFlight >= maxInFlight) return
    isScheduled = true
    // setImmediate rather than a microtask: requests read from other sockets in the same turn
    // of the event loop join this batch.
    setImmediate(pump)
  }

  return (item) =>
    new Promise<Out>((resolve, reject) => {
      queue.push({ item, resolve, reject })
      schedule()
    })
}
