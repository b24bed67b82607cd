import { defineStore } from 'pinia'
import { ref } from 'vue'
import type {
  LotTurnDeviationDto,
  LotYieldDetailDto,
  LotYieldDto,
  YieldSortKey,
  YieldSummaryDto,
} from '@shared/schemas/yield'
import type { ProductDto } from '@shared/schemas/recipes'
import { productsApi } from '@/api/products'
import { yieldApi } from '@/api/yield'
import { useFetched } from './lists/useFetched'
import { whileLoading } from './lists/whileLoading'

/** The board's period and filters; dates are whole UTC days, both included. */
export interface YieldFilter {
  from: string
  to: string
  productId: string
  revisionId: string
  sort: YieldSortKey | ''
  dir: 'asc' | 'desc'
}

const isoDay = (d: Date) => d.toISOString().slice(0, 10)

/** The last 30 days up to today. */
function defaultFilter(now = new Date()): YieldFilter {
  return {
    from: isoDay(new Date(now.getTime() - 29 * 86_400_000)),
    to: isoDay(now),
    productId: '',
    revisionId: '',
    sort: '',
    dir: 'desc',
  }
}

/** The lot picked on the board, with its step FPYs, detail and turn review. */
function useLotFigures() {
  const selectedLotId = ref<string | null>(null)
  const lotYield = ref<LotYieldDto | null>(null)
  const detail = ref<LotYieldDetailDto | null>(null)
  const turns = ref<LotTurnDeviationDto | null>(null)
  const isLotLoading = ref(false)

  /** Selects a lot and fetches its step FPYs, detail and turn review together. */
  async function selectLot(id: string) {
    selectedLotId.value = id
    const [y, d, t] = await whileLoading(isLotLoading, () =>
      Promise.all([yieldApi.lot(id), yieldApi.detail(id), yieldApi.turns(id)]),
    )
    if (selectedLotId.value !== id) return
    lotYield.value = y
    detail.value = d
    turns.value = t
  }

  /** Only the turn review, for the lot page. */
  async function fetchTurns(id: string) {
    turns.value = null
    turns.value = await yieldApi.turns(id)
  }

  return { selectedLotId, lotYield, detail, turns, isLotLoading, selectLot, fetchTurns }
}

/** The Yield board: the period's summary and the selected lot's figures and turn review. */
export const useYieldStore = defineStore('yield', () => {
  const filter = ref<YieldFilter>(defaultFilter())
  /** The KPIs and lots table for the filter; `fetchSummary` throws ApiError. */
  const {
    data: summary,
    isLoading,
    load: fetchSummary,
  } = useFetched<YieldSummaryDto | null>(() => yieldApi.summary(filter.value), null)
  /** Products and their revisions, for the filters. */
  const products = ref<ProductDto[]>([])

  async function fetchProducts() {
    products.value = await productsApi.list()
  }

  return {
    filter,
    summary,
    isLoading,
    products,
    fetchProducts,
    fetchSummary,
    /** The lot picked in the table (`selectedLotId`) and its figures. */
    ...useLotFigures(),
  }
})
