import type { Ref } from 'vue'

/**
 * Runs `work` with `flag` raised, for a spinner or a disabled button, and lowers it however the
 * work ends; what the work returns or throws passes through.
 * @param flag the store's loading or busy flag
 * @param work the API calls to wait for
 */
export async function whileLoading<T>(flag: Ref<boolean>, work: () => Promise<T>): Promise<T> {
  flag.value = true
  try {
    return await work()
  } finally {
    flag.value = false
  }
}
