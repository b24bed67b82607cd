import { describe, expect, it } from 'vitest'
import { ref } from 'vue'
import { whileLoading } from '@/stores/lists/whileLoading'

describe('whileLoading', () => {
  it('raises the flag while the work runs and passes its answer through', async () => {
    const flag = ref(false)
    let release: (value: string) => void = () => undefined
    const running = whileLoading(flag, () => new Promise<string>((r) => (release = r)))
    expect(flag.value).toBe(true)
    release('done')
    expect(await running).toBe('done')
    expect(flag.value).toBe(false)
  })

  it('lowers the flag and rethrows when the work fails', async () => {
    const flag = ref(false)
    await expect(whileLoading(flag, () => Promise.reject(new Error('offline')))).rejects.toThrow(
      'offline',
    )
    expect(flag.value).toBe(false)
  })
})
