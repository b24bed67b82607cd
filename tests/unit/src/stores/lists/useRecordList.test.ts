import { describe, expect, it } from 'vitest'
import { useRecordList } from '@/stores/lists/useRecordList'

interface Station {
  id: string
  code: string
}

/** An API fake that answers like the server: the saved record back. */
function fakeApi(list: Station[]) {
  return {
    list: async () => list.map((s) => ({ ...s })),
    create: async (input: { code: string }) => ({ id: `new-${input.code}`, code: input.code }),
    update: async (id: string, input: { code: string }) => ({ id, code: input.code }),
  }
}

describe('useRecordList', () => {
  it('fetches the list sorted by its key, and flags the fetch while it runs', async () => {
    const stations = useRecordList(
      fakeApi([
        { id: '1', code: 'WIND-02' },
        { id: '2', code: 'HIPOT-01' },
      ]),
      (s) => s.code,
    )
    const fetching = stations.fetchAll()
    expect(stations.isLoading.value).toBe(true)
    await fetching
    expect(stations.isLoading.value).toBe(false)
    expect(stations.rows.value.map((s) => s.code)).toEqual(['HIPOT-01', 'WIND-02'])
  })

  it('puts a created or updated record in its sorted place, once', async () => {
    const stations = useRecordList(fakeApi([{ id: '1', code: 'WIND-02' }]), (s) => s.code)
    await stations.fetchAll()
    expect(await stations.create({ code: 'LOAD-01' })).toEqual({
      id: 'new-LOAD-01',
      code: 'LOAD-01',
    })
    await stations.update('1', { code: 'AAA-01' })
    expect(stations.rows.value).toEqual([
      { id: '1', code: 'AAA-01' },
      { id: 'new-LOAD-01', code: 'LOAD-01' },
    ])
  })

  it('leaves the flag down and the list as it was when the fetch fails', async () => {
    const stations = useRecordList(
      { ...fakeApi([]), list: () => Promise.reject(new Error('offline')) },
      (s: Station) => s.code,
    )
    await expect(stations.fetchAll()).rejects.toThrow('offline')
    expect(stations.isLoading.value).toBe(false)
    expect(stations.rows.value).toEqual([])
  })
})
