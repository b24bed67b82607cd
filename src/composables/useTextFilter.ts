import { computed, ref } from 'vue'
import type { Ref } from 'vue'

/**
 * The text box above a list held whole in the browser: the rows whose words hold what was typed
 * (in any case, spaces at either end ignored), among those the page's other filters keep.
 * @param textOf the words a row is found by; fields joined with '\n' are matched one by one
 * @param keep the page's other filters, e.g. the kind chosen in a select
 */
export function useTextFilter<T>(
  rows: Ref<T[]>,
  textOf: (row: T) => string,
  keep: (row: T) => boolean = () => true,
) {
  /** What was typed in the box. */
  const text = ref('')
  /** The rows to show. */
  const shown = computed(() => {
    const needle = text.value.trim().toLowerCase()
    return rows.value.filter(
      (row) => keep(row) && (!needle || textOf(row).toLowerCase().includes(needle)),
    )
  })
  return { text, shown }
}
