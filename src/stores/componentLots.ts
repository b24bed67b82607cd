import { defineStore } from 'pinia'
import { reactive, ref } from 'vue'
import type { ComponentLotStatus } from '@shared/recipeDefinitions'
import type { COMPONENT_LOT_SORTS } from '@shared/schemas/componentLots'
import type { SupplierDto } from '@shared/schemas/suppliers'
import { componentLotsApi } from '@/api/componentLots'
import { suppliersApi } from '@/api/suppliers'
import { saving } from './lists/saving'
import { usePagedList } from './lists/usePagedList'

export type ComponentLotSort = (typeof COMPONENT_LOT_SORTS)[number]

/** Filters of the receiving list; empty strings mean "any". */
export interface ComponentLotFilters {
  q: string
  partId: string
  status: ComponentLotStatus | ''
}

/** Component lots as received by stores, paged, sorted and filtered on the server. */
export const useComponentLotsStore = defineStore('componentLots', () => {
  const sort = ref<ComponentLotSort>('receivedOn')
  const order = ref<'asc' | 'desc'>('desc')
  const filters = reactive<ComponentLotFilters>({ q: '', partId: '', status: '' })

  const list = usePagedList(
    (paging) =>
      componentLotsApi.list({
        ...paging,
        sort: sort.value,
        order: order.value,
        q: filters.q.trim() || undefined,
        partId: filters.partId || undefined,
        status: filters.status || undefined,
      }),
    25,
  )

  /** Receives a lot and shows the list again, so the new lot appears where the sort puts it. */
  const create = saving(componentLotsApi.create, list.fetchPage)
  const update = saving(componentLotsApi.update, list.put)
  const setStatus = saving(componentLotsApi.setStatus, list.put)
  const uploadCertificate = saving(componentLotsApi.uploadCertificate, list.put)
  /** Accepts or rejects a lot awaiting incoming inspection. */
  const inspect = saving(componentLotsApi.inspect, list.put)
  /** Suppliers on record whose name holds the typed text, for the receiving form. */
  const lookupSuppliers = (text: string): Promise<SupplierDto[]> =>
    suppliersApi.list({ q: text.trim(), limit: 12 })

  return {
    ...list,
    sort,
    order,
    filters,
    create,
    update,
    setStatus,
    uploadCertificate,
    inspect,
    lookupSuppliers,
    certificateUrl: componentLotsApi.certificateUrl,
    labelUrl: componentLotsApi.labelUrl,
  }
})
