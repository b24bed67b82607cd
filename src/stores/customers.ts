import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type {
  CustomerCreateInput,
  CustomerDto,
  CustomerUpdateInput,
} from '@shared/schemas/shipping'
import { customersApi } from '@/api/customers'

export const useCustomersStore = defineStore('customers', () => {
  /** Every customer, by name. */
  const customers = ref<CustomerDto[]>([])
  /** True while the list loads. */
  const isLoading = ref(false)
  /** Customers by id, for the links and pickers. */
  const byId = computed(() => new Map(customers.value.map((c) => [c.id, c])))

  /** Fetches the list; throws ApiError. */
  async function fetchAll() {
    isLoading.value = true
    try {
      customers.value = await customersApi.list()
    } finally {
      isLoading.value = false
    }
  }

  /** Adds a customer and returns it; throws ApiError with field messages. */
  async function create(input: CustomerCreateInput) {
    const created = await customersApi.create(input)
    await fetchAll()
    return created
  }

  /** Changes a customer; throws ApiError with field messages. */
  async function update(id: string, input: CustomerUpdateInput) {
    const updated = await customersApi.update(id, input)
    customers.value = customers.value.map((c) => (c.id === id ? updated : c))
    return updated
  }

  return { customers, isLoading, byId, fetchAll, create, update }
})
