import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { StatisticsDto } from '@shared/schemas/statistics'
import { statisticsApi } from '@/api/statistics'

/** Statistics on any numeric check: one lot's (lot page) and a product's (Yield board). */
export const useCheckStatisticsStore = defineStore('checkStatistics', () => {
  /** The lot page's checks and picked series, with the lot they belong to. */
  const lot = ref<(StatisticsDto & { lotId: string }) | null>(null)
  /** The Yield board's checks of the filtered product and the picked series. */
  const product = ref<StatisticsDto | null>(null)
  const isLoading = ref(false)

  /** Loads the lot's checks; picks `checkRef`, or else the first check with readings. */
  async function fetchLot(lotId: string, checkRef = '') {
    isLoading.value = true
    try {
      let got = await statisticsApi.lot(lotId, checkRef)
      const first = got.checks.find((c) => c.readings > 0)
      if (!checkRef && first) got = await statisticsApi.lot(lotId, first.ref)
      lot.value = { ...got, lotId }
    } finally {
      isLoading.value = false
    }
  }

  /** Loads a product's checks in the period; picks `checkRef`, or the first with readings. */
  async function fetchProduct(
    query: { productId: string; revisionId: string; from: string; to: string },
    checkRef = '',
  ) {
    isLoading.value = true
    try {
      let got = await statisticsApi.product({ ...query, checkKey: checkRef })
      const first = got.checks.find((c) => c.readings > 0)
      if (!checkRef && first) got = await statisticsApi.product({ ...query, checkKey: first.ref })
      product.value = got
    } finally {
      isLoading.value = false
    }
  }

  return { lot, product, isLoading, fetchLot, fetchProduct }
})
