import { defineStore } from 'pinia'
import { computed } from 'vue'
import { customersApi } from '@/api/customers'
import { saving } from './lists/saving'
import { useFetched } from './lists/useFetched'

export const useCustomersStore = defineStore('customers', () => {
  /** Every customer, by name; `isLoading` while the list loads, `fetchAll` throws ApiError. */
  const { data: customers, isLoading, load: fetchAll } = useFetched(customersApi.list, [])
  /** Customers by id, for the links and pickers. */
  const byId = computed(() => new Map(customers.value.map((c) => [c.id, c])))

  /** Adds a customer and returns it; throws ApiError with field messages. */
  const create = saving(customersApi.create, fetchAll)

  /** Changes a customer; throws ApiError with field messages. */
  const update = saving(customersApi.update, (updated) => {
    customers.value = customers.value.map((c) => (c.id === updated.id ? updated : c))
  })

  return { customers, isLoading, byId, fetchAll, create, update }
})
