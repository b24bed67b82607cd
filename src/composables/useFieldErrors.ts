import { ref } from 'vue'
import { ApiError } from '@/api/client'
import { toSentence } from './format'

/**
 * Holds the per-field messages a server refusal carried (400 `validation_failed`, 409
 * `duplicate`), ready for the `error` prop of each form item.
 */
export function useFieldErrors() {
  /** Field name to display message. */
  const fieldErrors = ref<Record<string, string>>({})

  /** Clears the messages; call before each submit so a repeated message shows again. */
  function clear() {
    fieldErrors.value = {}
  }

  /**
   * Takes the field messages of `error`.
   * @returns true when the error named at least one field, so the form already explains it
   */
  function apply(error: unknown): boolean {
    if (!(error instanceof ApiError)) return false
    const entries = Object.entries(error.fields).map(([k, v]) => [k, toSentence(v)] as const)
    fieldErrors.value = Object.fromEntries(entries)
    return entries.length > 0
  }

  return { fieldErrors, clear, apply }
}
