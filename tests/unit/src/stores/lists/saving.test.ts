import { describe, expect, it } from 'vitest'
import { saving } from '@/stores/lists/saving'

describe('saving', () => {
  it('passes the arguments on, keeps the answer and returns it', async () => {
    const kept: string[] = []
    const rename = saving(
      async (id: string, name: string) => `${id}:${name}`,
      (answer) => kept.push(answer),
    )
    expect(await rename('7', 'LOAD-01')).toBe('7:LOAD-01')
    expect(kept).toEqual(['7:LOAD-01'])
  })

  it('settles only after an asynchronous keep, e.g. a refetch of the list', async () => {
    const steps: string[] = []
    const create = saving(
      async () => 'created',
      async () => {
        await Promise.resolve()
        steps.push('refetched')
      },
    )
    await create()
    steps.push('returned')
    expect(steps).toEqual(['refetched', 'returned'])
  })

  it('keeps nothing when the call fails', async () => {
    const kept: unknown[] = []
    const update = saving(
      () => Promise.reject(new Error('409 duplicate')),
      (answer) => kept.push(answer),
    )
    await expect(update()).rejects.toThrow('409 duplicate')
    expect(kept).toEqual([])
  })
})
