import { flushPromises, mount } from '@vue/test-utils'
import { ElMessage, ElPagination } from 'element-plus'
import { afterEach, describe, expect, it, vi } from 'vitest'
import { defineComponent, h, reactive } from 'vue'
import PagedTable from '@/components/PagedTable.vue'
import { usePagedTable } from '@/composables/usePagedTable'

/** A store as usePagedList builds it, recording the pages it was asked for. */
function fakeStore(fail = false) {
  const asked: string[] = []
  const store = reactive({
    rows: [{ id: 'a' }],
    total: 120,
    page: 1,
    pageSize: 25,
    isLoading: false,
    loadError: null as string | null,
    async fetchPage() {
      asked.push(`page ${store.page} of ${store.pageSize}`)
      if (fail) throw new Error('The server is not answering')
    },
    async search() {
      store.page = 1
      await store.fetchPage()
    },
  })
  return { store, asked }
}

/** A list page showing the store through PagedTable, as the views do. */
function page(store: ReturnType<typeof fakeStore>['store']) {
  return mount(
    defineComponent(() => {
      const { table } = usePagedTable(store)
      return () => h(PagedTable, { ...table.value, emptyText: 'None' })
    }),
  )
}

afterEach(() => vi.restoreAllMocks())

describe('usePagedTable', () => {
  it('gives the table the store page and fetches the page chosen in the pager', async () => {
    const { store, asked } = fakeStore()
    const pager = page(store).findComponent(ElPagination)
    expect(pager.props('total')).toBe(120)
    pager.vm.$emit('update:current-page', 3)
    pager.vm.$emit('current-change', 3)
    await flushPromises()
    expect(store.page).toBe(3)
    expect(asked).toEqual(['page 3 of 25'])
  })

  it('fetches from the first page when the page size changes', async () => {
    const { store, asked } = fakeStore()
    store.page = 4
    page(store).findComponent(ElPagination).vm.$emit('size-change', 50)
    await flushPromises()
    expect(store.pageSize).toBe(50)
    expect(asked).toEqual(['page 1 of 50'])
  })

  it('shows a failed fetch as a message instead of throwing', async () => {
    const shown = vi.spyOn(ElMessage, 'error').mockImplementation(() => ({ close: () => {} }))
    const { store } = fakeStore(true)
    const { reload } = usePagedTable(store)
    await reload()
    expect(shown).toHaveBeenCalledWith('The server is not answering')
  })
})
