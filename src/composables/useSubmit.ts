import { ref } from 'vue'
import { ElMessage } from 'element-plus'
import { messageOf } from '@/api/client'
import { useFieldErrors } from './useFieldErrors'

/**
 * Runs a form's save: a saving flag for the button, the server's field messages for the form
 * items, and an ElMessage for the result. Other refusals are shown as a message.
 */
export function useSubmit() {
  /** True while the save runs. */
  const isSaving = ref(false)
  const { fieldErrors, clear, apply } = useFieldErrors()

  /**
   * @param action the store call
   * @param success the message on success (a function is asked after the action, so it may tell
   *   what the action did), or nothing to stay quiet
   * @param onError called with the error after it was shown, e.g. to reload a frozen revision
   * @returns true when the action succeeded
   */
  async function run(
    action: () => Promise<unknown>,
    success?: string | (() => string),
    onError?: (error: unknown) => void,
  ) {
    clear()
    isSaving.value = true
    try {
      await action()
      if (success) ElMessage.success(typeof success === 'function' ? success() : success)
      return true
    } catch (error) {
      if (!apply(error)) ElMessage.error(messageOf(error))
      onError?.(error)
      return false
    } finally {
      isSaving.value = false
    }
  }

  return { isSaving, fieldErrors, clearFieldErrors: clear, run }
}
