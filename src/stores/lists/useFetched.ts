import { ref } from 'vue'
import type { Ref } from 'vue'
import { whileLoading } from './whileLoading'

/**
 * One value a setup store fetches whole (a list, a summary), with its loading flag.
 * @param fetch asks the API for the value; it reads the store's filters itself
 * @param initial the value before the first fetch
 */
export function useFetched<T>(fetch: () => Promise<T>, initial: NoInfer<T>) {
  /** The last value fetched, or `initial`. */
  const data = ref(initial) as Ref<T>
  /** True while a fetch runs. */
  const isLoading = ref(false)

  /** Fetches the value again; throws ApiError and keeps the old value then. */
  async function load() {
    data.value = await whileLoading(isLoading, fetch)
  }

  return { data, isLoading, load }
}
