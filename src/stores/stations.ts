import { defineStore } from 'pinia'
import { computed } from 'vue'
import { stationsApi } from '@/api/stations'
import { useRecordList } from './lists/useRecordList'

export const useStationsStore = defineStore('stations', () => {
  /** Every station, sorted by code, with the list's flag and calls (`isLoading`, `fetchAll`, …). */
  const { rows: stations, ...list } = useRecordList(stationsApi, (s) => s.code)
  /** Stations operators can currently use. */
  const activeStations = computed(() => stations.value.filter((s) => s.isActive))

  return { stations, activeStations, ...list }
})
