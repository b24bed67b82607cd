import { onScopeDispose, ref, watch } from 'vue'
import type { RouteLocationRaw } from 'vue-router'
import type { SearchGroupDto, SearchHitDto } from '@shared/schemas/search'
import { SEARCH_TEXT_MIN } from '@shared/schemas/search'
import { messageOf } from '@/api/client'
import { searchApi } from '@/api/search'

/** How long typing must pause before the box asks the server. */
const PAUSE_MS = 150

type HitScreen = (hit: SearchHitDto) => RouteLocationRaw

/** A screen that opens the record named in its `open` query, e.g. a drawer over a list. */
const opening =
  (name: string): HitScreen =>
  (hit) => ({ name, query: { open: hit.id } })
/** A screen of the record's own, at its id. */
const ownPage =
  (name: string): HitScreen =>
  (hit) => ({ name, params: { id: hit.id } })

/** The screen that shows each kind of record the search finds. */
const HIT_SCREENS: Record<SearchHitDto['kind'], HitScreen> = {
  unit: (hit) => ({ name: 'trace', query: { serial: hit.ref } }),
  lot: ownPage('lot'),
  componentLot: (hit) => ({ name: 'componentLots', query: { q: hit.ref } }),
  customer: opening('customers'),
  revision: ownPage('revision'),
  shipment: opening('shipping'),
  serviceCase: opening('service'),
}

/** The screen that shows a record the search found. */
export function searchHitRoute(hit: SearchHitDto): RouteLocationRaw {
  return HIT_SCREENS[hit.kind](hit)
}

/**
 * The top bar's search: `query` is what the box holds; once typing pauses, `groups` hold what
 * the server found for it. An answer to an older query than the latest is dropped, so a slow
 * answer never replaces a newer one.
 */
export function useGlobalSearch() {
  const query = ref('')
  const groups = ref<SearchGroupDto[]>([])
  /** The text `groups` answer, so the box can tell "nothing found" from "not asked yet". */
  const answered = ref('')
  const isLoading = ref(false)
  const problem = ref<string | null>(null)
  let asked = 0
  let timer: ReturnType<typeof setTimeout> | undefined

  async function ask(text: string) {
    const mine = ++asked
    isLoading.value = true
    try {
      const result = await searchApi.find(text)
      if (mine !== asked) return
      groups.value = result.groups
      answered.value = text
      problem.value = null
    } catch (error) {
      if (mine === asked) problem.value = messageOf(error)
    } finally {
      if (mine === asked) isLoading.value = false
    }
  }

  watch(query, (value) => {
    clearTimeout(timer)
    const text = value.trim()
    if (text.length < SEARCH_TEXT_MIN) {
      asked++
      groups.value = []
      answered.value = ''
      isLoading.value = false
      problem.value = null
      return
    }
    timer = setTimeout(() => void ask(text), PAUSE_MS)
  })
  onScopeDispose(() => clearTimeout(timer))

  return { query, groups, answered, isLoading, problem }
}
