import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { StationCreateInput, StationDto, StationUpdateInput } from '@shared/schemas/stations'
import { stationsApi } from '@/api/stations'

export const useStationsStore = defineStore('stations', () => {
  /** Every station, sorted by code. */
  const stations = ref<StationDto[]>([])
  /** True while the list is being fetched. */
  const isLoading = ref(false)
  /** Stations operators can currently use. */
  const activeStations = computed(() => stations.value.filter((s) => s.isActive))

  function put(station: StationDto) {
    const rest = stations.value.filter((s) => s.id !== station.id)
    stations.value = [...rest, station].sort((a, b) => a.code.localeCompare(b.code))
  }

  /** Fetches every station; throws ApiError, the view decides how to show it. */
  async function fetchAll() {
    isLoading.value = true
    try {
      stations.value = (await stationsApi.list()).sort((a, b) => a.code.localeCompare(b.code))
    } finally {
      isLoading.value = false
    }
  }

  /** Creates a station and keeps it in the list. */
  async function create(input: StationCreateInput) {
    const station = await stationsApi.create(input)
    put(station)
    return station
  }

  /** Updates a station and replaces it in the list. */
  async function update(id: string, input: StationUpdateInput) {
    const station = await stationsApi.update(id, input)
    put(station)
    return station
  }

  return { stations, isLoading, activeStations, fetchAll, create, update }
})
