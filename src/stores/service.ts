import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { StepDto } from '@shared/schemas/recipes'
import type {
  ServiceCaseCloseInput,
  ServiceCaseCreateInput,
  ServiceCaseDto,
  ServiceCaseUpdateInput,
} from '@shared/schemas/shipping'
import { revisionsApi } from '@/api/revisions'
import { serviceCasesApi } from '@/api/serviceCases'

export const useServiceStore = defineStore('service', () => {
  /** Cases, open ones first. */
  const cases = ref<ServiceCaseDto[]>([])
  const isLoading = ref(false)
  /** The filter of the list; empty for every case. */
  const status = ref<'open' | 'closed' | ''>('open')
  /** The case open in the drawer and the route of its unit (its documents have their panel). */
  const current = ref<ServiceCaseDto | null>(null)
  const steps = ref<StepDto[]>([])

  /** Fetches the list with the current filter; throws ApiError. */
  async function fetchAll() {
    isLoading.value = true
    try {
      cases.value = await serviceCasesApi.list({ status: status.value || undefined })
    } finally {
      isLoading.value = false
    }
  }

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
  async function create(input: ServiceCaseCreateInput) {
    const c = await serviceCasesApi.open(input)
    await fetchAll()
    return c
  }

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
