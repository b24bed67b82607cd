import { onScopeDispose, watch } from 'vue'

/**
 * Calls `refresh` every `intervalMs` while `isActive()` holds, e.g. while a document is being
 * made. A failed refresh is retried on the next tick; nothing runs once the scope ends.
 */
export function usePolling(
  isActive: () => boolean,
  refresh: () => Promise<unknown>,
  intervalMs = 1500,
) {
  let timer: ReturnType<typeof setTimeout> | undefined
  let isStopped = false

  function schedule() {
    clearTimeout(timer)
    if (isStopped || !isActive()) return
    timer = setTimeout(async () => {
      await refresh().catch(() => undefined)
      schedule()
    }, intervalMs)
  }

  watch(isActive, (active) => (active ? schedule() : clearTimeout(timer)), { immediate: true })
  onScopeDispose(() => {
    isStopped = true
    clearTimeout(timer)
  })
}
