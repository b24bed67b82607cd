import { reactive } from 'vue'
import type { UnwrapNestedRefs } from 'vue'

/**
 * The reactive form of a create/edit dialog, and `fill`, which loads it from the record being
 * edited or empties it for a new one. The form's keys are those of `empty()`.
 * @param empty the values of a new record; a function, so a default such as today is fresh
 */
export function useRecordForm<F extends object>(empty: () => F) {
  const form = reactive(empty())

  /**
   * Copies each of the form's keys from `record`, where it holds a value, else from `empty()`.
   * Arrays are copied, so editing the form never changes the record.
   */
  function fill(record: { readonly [K in keyof F]?: F[K] | null } | null | undefined) {
    const blank = empty()
    for (const key of Object.keys(blank) as (keyof F)[]) {
      const value = record?.[key] ?? blank[key]
      ;(form as F)[key] = (Array.isArray(value) ? [...value] : value) as F[keyof F]
    }
  }

  return { form: form as UnwrapNestedRefs<F>, fill }
}
