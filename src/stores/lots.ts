import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import { FINISHED_UNIT_STATES } from '@shared/lots'
import type { UnitState } from '@shared/lots'
import type {
  DispositionInput,
  DocumentDto,
  LotDto,
  LotGridDto,
  NonconformanceDto,
} from '@shared/schemas/lots'
import { lotsApi } from '@/api/lots'
import type { DocumentRequest } from '@/api/lots'
import { nonconformancesApi } from '@/api/nonconformances'
import { productsApi } from '@/api/products'
import { saving } from './lists/saving'
import { useFetched } from './lists/useFetched'

/** A released revision a new lot can build, for the revision select. */
export interface RevisionChoice {
  id: string
  label: string
  productCode: string
}

/** Lots: the list, and the one lot open on its page with its grid, documents and nonconformances. */
export const useLotsStore = defineStore('lots', () => {
  /** Every lot, newest first; `fetchAll` throws ApiError. */
  const { data: lots, isLoading, load: fetchAll } = useFetched(lotsApi.list, [])
  /** The lot open on its page. */
  const lot = ref<LotDto | null>(null)
  const grid = ref<LotGridDto | null>(null)
  const documents = ref<DocumentDto[]>([])
  /** Open nonconformances of the open lot. */
  const nonconformances = ref<NonconformanceDto[]>([])
  /** Released revisions, for a new lot. */
  const revisionChoices = ref<RevisionChoice[]>([])
  /** True while any document of the open lot is still being made. */
  const hasPendingDocuments = computed(() =>
    documents.value.some((d) => d.status === 'queued' || d.status === 'running'),
  )
  /** Every unit of the open lot has finished its route (passed, scrapped, shipped or returned). */
  const isEveryUnitFinished = computed(() => {
    const counts = Object.entries(lot.value?.counts ?? {}) as [UnitState, number][]
    const total = counts.reduce((sum, [, n]) => sum + n, 0)
    return (
      total > 0 && counts.every(([state, n]) => n === 0 || FINISHED_UNIT_STATES.includes(state))
    )
  })

  /** Puts a lot in the list (a new one first) and on its page when it is open there. */
  function put(next: LotDto) {
    lots.value = lots.value.some((l) => l.id === next.id)
      ? lots.value.map((l) => (l.id === next.id ? next : l))
      : [next, ...lots.value]
    if (lot.value?.id === next.id) lot.value = next
  }

  /** Fetches the released revisions of every product, for the New lot dialog. */
  async function fetchRevisionChoices() {
    const products = await productsApi.list()
    revisionChoices.value = products.flatMap((p) =>
      p.revisions
        .filter((r) => r.status === 'released')
        .map((r) => ({
          id: r.id,
          productCode: p.code,
          label: `${p.code} rev ${r.letter} · ${p.name}`,
        })),
    )
  }

  const create = saving(lotsApi.create, put)
  const update = saving(lotsApi.update, put)

  /** Opens a lot's page: the lot, its grid, documents and open nonconformances together. */
  async function open(id: string) {
    if (lot.value?.id !== id) {
      lot.value = null
      grid.value = null
      documents.value = []
      nonconformances.value = []
    }
    const [l, g, d, n] = await Promise.all([
      lotsApi.get(id),
      lotsApi.grid(id),
      lotsApi.documents(id),
      nonconformancesApi.list({ lotId: id, status: 'open' }),
    ])
    lot.value = l
    grid.value = g
    documents.value = d
    nonconformances.value = n
    put(l)
  }

  /** Reloads what a lot action or a disposition changes. */
  async function refresh() {
    if (lot.value) await open(lot.value.id)
  }

  /** Runs a lot action (release, hold, …) and reloads the page's data. */
  async function act(action: (id: string) => Promise<LotDto>) {
    if (!lot.value) return
    put(await action(lot.value.id))
    await refresh()
  }

  const release = () => act(lotsApi.release)
  const hold = (reason: string) => act((id) => lotsApi.hold(id, reason))
  const unhold = (reason: string) => act((id) => lotsApi.unhold(id, reason))
  const close = () => act(lotsApi.close)

  async function fetchDocuments() {
    if (lot.value) documents.value = await lotsApi.documents(lot.value.id)
  }

  async function requestDocument(input: DocumentRequest) {
    if (!lot.value) return
    const doc = await lotsApi.requestDocument(lot.value.id, input)
    documents.value = [doc, ...documents.value.filter((d) => d.id !== doc.id)]
  }

  /** Decides a nonconformance, then reloads the grid and counts it changes. */
  async function dispose(id: string, input: DispositionInput) {
    const decided = await nonconformancesApi.dispose(id, input)
    await refresh()
    return decided
  }

  return {
    lots,
    isLoading,
    lot,
    grid,
    documents,
    nonconformances,
    revisionChoices,
    hasPendingDocuments,
    isEveryUnitFinished,
    fetchAll,
    fetchRevisionChoices,
    create,
    update,
    open,
    refresh,
    release,
    hold,
    unhold,
    close,
    fetchDocuments,
    requestDocument,
    dispose,
  }
})
