import { ref, watch } from 'vue'
import { useRoute } from 'vue-router'

/**
 * A list page whose record opens in a drawer: `open(id)` loads the record and shows the drawer,
 * and the top bar's search opens one by linking to the page with `?open=<id>`.
 */
export function useOpenQuery(load: (id: string) => Promise<unknown>, report: (e: unknown) => void) {
  const isDrawerOpen = ref(false)
  async function open(row: { id: string }) {
    try {
      await load(row.id)
      isDrawerOpen.value = true
    } catch (e) {
      report(e)
    }
  }
  const route = useRoute()
  watch(
    () => route.query.open,
    (id) => typeof id === 'string' && void open({ id }),
    { immediate: true },
  )
  return { isDrawerOpen, open }
}
