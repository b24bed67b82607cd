import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { StatisticsDto } from '@shared/schemas/statistics'
import { statisticsApi } from '@/api/statistics'
import { whileLoading } from './lists/whileLoading'

/**
 * Fetches the statistics of `checkRef`; without one, of the first check that has readings (the
 * first answer lists the checks), else that first answer.
 */
async function firstWithReadings(
  checkRef: string,
  fetch: (checkRef: string) => Promise<StatisticsDto>,
): Promise<StatisticsDto> {
  const got = await fetch(checkRef)
  const first = got.checks.find((c) => c.readings > 0)
  return !checkRef && first ? fetch(first.ref) : got
}

/** Statistics on any numeric check: one lot's (lot page) and a product's (Yield board). */
export const useCheckStatisticsStore = defineStore('checkStatistics', () => {
  /** The lot page's checks and picked series, with the lot they belong to. */
  const lot = ref<(StatisticsDto & { lotId: string }) | null>(null)
  /** The Yield board's checks of the filtered product and the picked series. */
  const product = ref<StatisticsDto | null>(null)
  const isLoading = ref(false)

  /** Loads the lot's checks; picks `checkRef`, or else the first check with readings. */
  async function fetchLot(lotId: string, checkRef = '') {
    const got = await whileLoading(isLoading, () =>
      firstWithReadings(checkRef, (ref) => statisticsApi.lot(lotId, ref)),
    )
    lot.value = { ...got, lotId }
  }

  /** Loads a product's checks in the period; picks `checkRef`, or the first with readings. */
  async function fetchProduct(
    query: { productId: string; revisionId: string; from: string; to: string },
    checkRef = '',
  ) {
    product.value = await whileLoading(isLoading, () =>
      firstWithReadings(checkRef, (ref) => statisticsApi.product({ ...query, checkKey: ref })),
    )
  }

  return { lot, product, isLoading, fetchLot, fetchProduct }
})
