import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { StepDto } from '@shared/schemas/recipes'
import type {
  ServiceCaseCloseInput,
  ServiceCaseDto,
  ServiceCaseUpdateInput,
} from '@shared/schemas/shipping'
import { revisionsApi } from '@/api/revisions'
import { serviceCasesApi } from '@/api/serviceCases'
import { saving } from './lists/saving'
import { useFetched } from './lists/useFetched'

export const useServiceStore = defineStore('service', () => {
  /** The filter of the list; empty for every case. */
  const status = ref<'open' | 'closed' | ''>('open')
  /** Cases with the current filter, open ones first; `fetchAll` throws ApiError. */
  const {
    data: cases,
    isLoading,
    load: fetchAll,
  } = useFetched(() => serviceCasesApi.list({ status: status.value || undefined }), [])
  /** The case open in the drawer and the route of its unit (its documents have their panel). */
  const current = ref<ServiceCaseDto | null>(null)
  const steps = ref<StepDto[]>([])

  function put(c: ServiceCaseDto) {
    current.value = c
    cases.value = cases.value.map((x) => (x.id === c.id ? c : x))
  }

  /** Opens a case in the drawer with its unit's route; throws ApiError. */
  async function open(id: string) {
    const c = await serviceCasesApi.get(id)
    current.value = c
    steps.value = (await revisionsApi.get(c.revisionId)).steps
  }

  /** Logs a return; the unit becomes returned. Throws ApiError with field messages. */
  const create = saving(serviceCasesApi.open, fetchAll)

  async function update(input: ServiceCaseUpdateInput) {
    if (current.value) put(await serviceCasesApi.update(current.value.id, input))
  }

  async function closeCase(input: ServiceCaseCloseInput) {
    if (current.value) put(await serviceCasesApi.close(current.value.id, input))
  }

  function close() {
    current.value = null
    steps.value = []
  }

  return {
    cases,
    isLoading,
    status,
    current,
    steps,
    fetchAll,
    open,
    create,
    update,
    closeCase,
    close,
  }
})
