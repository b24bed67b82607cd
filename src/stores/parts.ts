import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { PartDto, PartInput } from '@shared/schemas/recipes'
import type { PART_SORTS } from '@shared/schemas/componentLots'
import { partsApi } from '@/api/parts'
import { usePagedList } from './lists/usePagedList'

export type PartSort = (typeof PART_SORTS)[number]

/** The parts list, paged, searched and sorted on the server; also the search behind part pickers. */
export const usePartsStore = defineStore('parts', () => {
  /** Text searched in part number and description. */
  const q = ref('')
  const sort = ref<PartSort>('partNumber')
  const order = ref<'asc' | 'desc'>('asc')

  const { rows, total, page, pageSize, isLoading, loadError, fetchPage, search } = usePagedList(
    (paging) =>
      partsApi.list({
        ...paging,
        q: q.value.trim() || undefined,
        sort: sort.value,
        order: order.value,
      }),
    25,
  )

  /** The first parts matching `text`, for a picker; leaves the list untouched. */
  async function lookup(text: string): Promise<PartDto[]> {
    return (await partsApi.list({ page: 1, pageSize: 20, q: text.trim() || undefined })).rows
  }

  /** Creates a part and shows the list again from the first page. */
  async function create(input: PartInput) {
    const part = await partsApi.create(input)
    await fetchPage()
    return part
  }

  /** Updates a part in place. */
  async function update(id: string, input: Partial<PartInput>) {
    const part = await partsApi.update(id, input)
    rows.value = rows.value.map((p) => (p.id === id ? part : p))
    return part
  }

  return {
    rows,
    total,
    page,
    pageSize,
    q,
    sort,
    order,
    isLoading,
    loadError,
    fetchPage,
    search,
    lookup,
    create,
    update,
  }
})
