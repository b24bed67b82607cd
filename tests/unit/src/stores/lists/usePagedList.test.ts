import { describe, expect, it } from 'vitest'
import { usePagedList } from '@/stores/lists/usePagedList'

interface Part {
  id: string
  partNumber: string
}

const PARTS: Part[] = [
  { id: '1', partNumber: 'C-100' },
  { id: '2', partNumber: 'L-220' },
  { id: '3', partNumber: 'Q-015' },
]

/** A server fake: the page asked for, and the total over every page. */
const fetchPart = async ({ page, pageSize }: { page: number; pageSize: number }) => ({
  rows: PARTS.slice((page - 1) * pageSize, page * pageSize),
  total: PARTS.length,
})

describe('usePagedList', () => {
  it('fetches the current page with the total, flagging the fetch while it runs', async () => {
    const list = usePagedList(fetchPart, 2)
    list.page.value = 2
    const fetching = list.fetchPage()
    expect(list.isLoading.value).toBe(true)
    await fetching
    expect(list.isLoading.value).toBe(false)
    expect(list.rows.value.map((p) => p.partNumber)).toEqual(['Q-015'])
    expect(list.total.value).toBe(3)
  })

  it('searches from the first page', async () => {
    const list = usePagedList(fetchPart, 2)
    list.page.value = 2
    await list.search()
    expect(list.page.value).toBe(1)
    expect(list.rows.value.map((p) => p.id)).toEqual(['1', '2'])
  })

  it('keeps the failure message, rethrows it and clears it on the next good fetch', async () => {
    let isOnline = false
    const list = usePagedList((paging) =>
      isOnline ? fetchPart(paging) : Promise.reject(new Error('offline')),
    )
    await expect(list.fetchPage()).rejects.toThrow('offline')
    expect(list.loadError.value).toBe('Offline') // as messageOf words it for the screen
    expect(list.isLoading.value).toBe(false)
    isOnline = true
    await list.fetchPage()
    expect(list.loadError.value).toBeNull()
  })

  it('puts a saved row in place of the one with its id and returns it', async () => {
    const list = usePagedList(fetchPart, 2)
    await list.fetchPage()
    const saved = { id: '2', partNumber: 'L-221' }
    expect(list.put(saved)).toBe(saved)
    expect(list.rows.value).toEqual([{ id: '1', partNumber: 'C-100' }, saved])
  })
})
