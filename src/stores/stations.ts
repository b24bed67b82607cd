import { defineStore } from 'pinia'
import { computed } from 'vue'
import { stationsApi } from '@/api/stations'
import { useRecordList } from './lists/useRecordList'

export const useStationsStore = defineStore('stations', () => {
  /** Every station, sorted by code; `isLoading` while they are fetched. */
  const {
    rows: stations,
    isLoading,
    fetchAll,
    create,
    update,
  } = useRecordList(stationsApi, (s) => s.code)
  /** Stations operators can currently use. */
  const activeStations = computed(() => stations.value.filter((s) => s.isActive))

  return { stations, isLoading, activeStations, fetchAll, create, update }
})
