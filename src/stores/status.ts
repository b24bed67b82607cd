import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { SystemStatusDto } from '@shared/schemas/status'
import { outboxApi } from '@/api/outbox'
import { statusApi } from '@/api/status'
import { useFetched } from './lists/useFetched'

export const useStatusStore = defineStore('status', () => {
  /** The last answer of the status check, or null before the first; `fetch` throws ApiError. */
  const {
    data: status,
    isLoading,
    load: fetch,
  } = useFetched<SystemStatusDto | null>(statusApi.get, null)
  /** Id of the e-mail being sent again, for its button's spinner. */
  const retryingId = ref<string | null>(null)

  /** Sends a failed e-mail again, then refreshes the page's figures; throws ApiError. */
  async function retryEmail(id: string) {
    retryingId.value = id
    try {
      await outboxApi.retry(id)
    } finally {
      retryingId.value = null
    }
    await fetch()
  }

  return { status, isLoading, retryingId, fetch, retryEmail }
})
