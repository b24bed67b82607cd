import { computed, onScopeDispose, ref, toValue, watch } from 'vue'
import type { MaybeRefOrGetter } from 'vue'
import type { AlertDto } from '@shared/schemas/alerts'
import { alertsApi } from '@/api/alerts'
import { messageOf } from '@/api/client'

/**
 * The quality alerts of one lot (or of every lot without a lot id), refreshed every
 * `intervalMs`: the alerts worker raises them a moment after the scan that tripped them.
 */
export function useAlerts(lotId: MaybeRefOrGetter<string | undefined>, intervalMs = 30_000) {
  const alerts = ref<AlertDto[]>([])
  const isLoading = ref(false)
  const error = ref('')
  const busyId = ref<string | null>(null)
  const openCount = computed(() => alerts.value.filter((a) => a.status === 'open').length)

  /** Loads the list again; a failure is kept in `error` and the last list stays. */
  async function refresh() {
    isLoading.value = alerts.value.length === 0
    try {
      alerts.value = await alertsApi.list({ lotId: toValue(lotId) })
      error.value = ''
    } catch (e) {
      error.value = messageOf(e)
    } finally {
      isLoading.value = false
    }
  }

  /** Acknowledges one alert and puts the server's answer in its place; throws ApiError. */
  async function acknowledge(id: string) {
    busyId.value = id
    try {
      const updated = await alertsApi.acknowledge(id)
      alerts.value = alerts.value.map((a) => (a.id === id ? updated : a))
    } finally {
      busyId.value = null
    }
  }

  /**
   * Acknowledges every open alert, or those of one lot, then loads the list again (the server
   * says which it acknowledged; others may have come meanwhile). Throws ApiError.
   */
  async function acknowledgeAll(ofLotId?: string): Promise<number> {
    busyId.value = ofLotId ? `lot:${ofLotId}` : 'all'
    try {
      const done = await alertsApi.acknowledgeAll(ofLotId)
      await refresh()
      return done.acknowledged
    } finally {
      busyId.value = null
    }
  }

  watch(() => toValue(lotId), refresh, { immediate: true })
  const timer = setInterval(() => void refresh(), intervalMs)
  onScopeDispose(() => clearInterval(timer))
  return { alerts, isLoading, error, busyId, openCount, refresh, acknowledge, acknowledgeAll }
}
