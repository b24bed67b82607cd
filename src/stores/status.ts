import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { SystemStatusDto } from '@shared/schemas/status'
import { outboxApi } from '@/api/outbox'
import { statusApi } from '@/api/status'

export const useStatusStore = defineStore('status', () => {
  /** The last answer of the status check, or null before the first. */
  const status = ref<SystemStatusDto | null>(null)
  /** True while the status is being fetched. */
  const isLoading = ref(false)
  /** Id of the e-mail being sent again, for its button's spinner. */
  const retryingId = ref<string | null>(null)

  /** Asks the server for the current status; throws ApiError. */
  async function fetch() {
    isLoading.value = true
    try {
      status.value = await statusApi.get()
    } finally {
      isLoading.value = false
    }
  }

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
