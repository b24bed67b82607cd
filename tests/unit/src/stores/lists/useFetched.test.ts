import { describe, expect, it } from 'vitest'
import { useFetched } from '@/stores/lists/useFetched'

describe('useFetched', () => {
  it('starts from the initial value and flags each fetch while it runs', async () => {
    let answer = ['LOT-1']
    const lots = useFetched(async () => answer, [])
    expect(lots.data.value).toEqual([])
    const loading = lots.load()
    expect(lots.isLoading.value).toBe(true)
    await loading
    expect(lots.isLoading.value).toBe(false)
    expect(lots.data.value).toEqual(['LOT-1'])
    answer = ['LOT-2', 'LOT-1']
    await lots.load()
    expect(lots.data.value).toEqual(['LOT-2', 'LOT-1'])
  })

  it('keeps the last value and lowers the flag when a fetch fails', async () => {
    let isOnline = true
    const status = useFetched<string | null>(
      () => (isOnline ? Promise.resolve('ok') : Promise.reject(new Error('offline'))),
      null,
    )
    await status.load()
    isOnline = false
    await expect(status.load()).rejects.toThrow('offline')
    expect(status.data.value).toBe('ok')
    expect(status.isLoading.value).toBe(false)
  })
})
