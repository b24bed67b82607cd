import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { PartDto } from '@shared/schemas/recipes'
import type { PART_SORTS } from '@shared/schemas/componentLots'
import { partsApi } from '@/api/parts'
import { saving } from './lists/saving'
import { usePagedList } from './lists/usePagedList'

export type PartSort = (typeof PART_SORTS)[number]

/** The parts list, paged, searched and sorted on the server; also the search behind part pickers. */
export const usePartsStore = defineStore('parts', () => {
  /** Text searched in part number and description. */
  const q = ref('')
  const sort = ref<PartSort>('partNumber')
  const order = ref<'asc' | 'desc'>('asc')

  const list = usePagedList(
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

  /** Creates a part and shows the current page again. */
  const create = saving(partsApi.create, list.fetchPage)
  /** Updates a part in place. */
  const update = saving(partsApi.update, list.put)

  return {
    ...list,
    q,
    sort,
    order,
    lookup,
    create,
    update,
  }
})
