import { ref } from 'vue'
import type { Ref } from 'vue'
import { messageOf } from '@/api/client'
import { whileLoading } from './whileLoading'

/** One page of a list as the server sends it. */
export interface Page<T> {
  rows: T[]
  total: number
}

/**
 * State of a list paged on the server, for a setup store: the rows of the current page, the
 * total, the page and its size, a loading flag and the last load's error.
 * @param fetch asks the API for one page; the store adds its own filters and sort
 * @param pageSize rows per page at first
 */
export function usePagedList<T extends { id: string }>(
  fetch: (paging: { page: number; pageSize: number }) => Promise<Page<T>>,
  pageSize = 25,
) {
  /** Rows of the current page. */
  const rows = ref([]) as Ref<T[]>
  /** Rows matching the filters, over all pages. */
  const total = ref(0)
  const page = ref(1)
  const size = ref(pageSize)
  /** True while a page is being fetched. */
  const isLoading = ref(false)
  /** Why the last fetch failed, or null. */
  const loadError = ref<string | null>(null)

  /** Fetches the current page; throws ApiError. */
  async function fetchPage() {
    try {
      const result = await whileLoading(isLoading, () =>
        fetch({ page: page.value, pageSize: size.value }),
      )
      rows.value = result.rows
      total.value = result.total
      loadError.value = null
    } catch (error) {
      loadError.value = messageOf(error)
      throw error
    }
  }

  /** Shows a saved row in place of the one with its id on this page; returns it. */
  function put(row: T) {
    rows.value = rows.value.map((r) => (r.id === row.id ? row : r))
    return row
  }

  /** Applies changed filters or sort from the first page. */
  async function search() {
    page.value = 1
    await fetchPage()
  }

  return { rows, total, page, pageSize: size, isLoading, loadError, fetchPage, search, put }
}
