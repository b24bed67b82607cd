import { computed } from 'vue'
import { ElMessage } from 'element-plus'
import { messageOf } from '@/api/client'

/** What a store built on `usePagedList` offers the page that shows it. */
export interface PagedStore {
  readonly rows: readonly object[]
  readonly total: number
  page: number
  pageSize: number
  readonly isLoading: boolean
  readonly loadError: string | null
  fetchPage(): Promise<void>
  search(): Promise<void>
}

/** PagedTable's props and listeners for one paged store, to pass with `v-bind`. */
export interface PagedTableBinding {
  rows: object[]
  total: number
  page: number
  pageSize: number
  isLoading: boolean
  loadError: string | null
  'onUpdate:page': (page: number) => void
  'onUpdate:pageSize': (pageSize: number) => void
  onReload: () => void
  onSearch: () => void
}

/**
 * A list page's hold on its paged store: fetching the current page or the first one, each
 * failure shown as a message, and the binding that wires PagedTable to the store
 * (`<PagedTable v-bind="table" …>`): its rows, pager and loading state.
 */
export function usePagedTable(store: PagedStore) {
  const report = (error: unknown) => ElMessage.error(messageOf(error))
  const reload = () => store.fetchPage().catch(report)
  const search = () => store.search().catch(report)
  const table = computed<PagedTableBinding>(() => ({
    rows: store.rows as object[],
    total: store.total,
    page: store.page,
    pageSize: store.pageSize,
    isLoading: store.isLoading,
    loadError: store.loadError,
    'onUpdate:page': (page) => (store.page = page),
    'onUpdate:pageSize': (pageSize) => (store.pageSize = pageSize),
    onReload: () => void reload(),
    onSearch: () => void search(),
  }))
  return { report, reload, search, table }
}
