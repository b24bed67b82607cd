import { defineStore } from 'pinia'
import { reactive, ref } from 'vue'
import type { ComponentLotStatus } from '@shared/recipeDefinitions'
import type {
  COMPONENT_LOT_SORTS,
  ComponentLotCreateInput,
  ComponentLotDto,
  ComponentLotInspectionInput,
  ComponentLotStatusInput,
  ComponentLotUpdateInput,
} from '@shared/schemas/componentLots'
import type { SupplierDto } from '@shared/schemas/suppliers'
import { componentLotsApi } from '@/api/componentLots'
import { suppliersApi } from '@/api/suppliers'
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

  const { rows, total, page, pageSize, isLoading, loadError, fetchPage, search } = usePagedList(
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

  function put(lot: ComponentLotDto) {
    rows.value = rows.value.map((l) => (l.id === lot.id ? lot : l))
    return lot
  }

  /** Receives a lot and shows the list again, so the new lot appears where the sort puts it. */
  async function create(input: ComponentLotCreateInput) {
    const lot = await componentLotsApi.create(input)
    await fetchPage()
    return lot
  }

  const update = async (id: string, input: ComponentLotUpdateInput) =>
    put(await componentLotsApi.update(id, input))
  const setStatus = async (id: string, input: ComponentLotStatusInput) =>
    put(await componentLotsApi.setStatus(id, input))
  const uploadCertificate = async (id: string, file: File) =>
    put(await componentLotsApi.uploadCertificate(id, file))
  /** Accepts or rejects a lot awaiting incoming inspection. */
  const inspect = async (id: string, input: ComponentLotInspectionInput) =>
    put(await componentLotsApi.inspect(id, input))
  /** Suppliers on record whose name holds the typed text, for the receiving form. */
  const lookupSuppliers = (text: string): Promise<SupplierDto[]> =>
    suppliersApi.list({ q: text.trim(), limit: 12 })

  return {
    rows,
    total,
    page,
    pageSize,
    sort,
    order,
    filters,
    isLoading,
    loadError,
    fetchPage,
    search,
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
