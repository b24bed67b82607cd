import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type {
  FloorUnitDto,
  RecentRunDto,
  StepRunInput,
  StepRunResultDto,
  WaitingUnitsDto,
} from '@shared/schemas/lots'
import type { StationDto } from '@shared/schemas/stations'
import { floorApi } from '@/api/floor'
import { stationsApi } from '@/api/stations'
import { whileLoading } from './lists/whileLoading'

/** One station screen: which station it is, the unit scanned last and the station's recent runs. */
export const useFloorStore = defineStore('floor', () => {
  /** The station code from the route, upper-case. */
  const stationCode = ref('')
  /** The station record; null until loaded or when the code is unknown. */
  const station = ref<StationDto | null>(null)
  /** Active stations, for the picker. */
  const stations = ref<StationDto[]>([])
  /** What the last scan returned; null before a scan and after a step run is recorded. */
  const current = ref<FloorUnitDto | null>(null)
  /** The station's last step runs, newest first. */
  const recent = ref<RecentRunDto[]>([])
  /** The units whose next step is worked here, oldest first. */
  const waiting = ref<WaitingUnitsDto>({ total: 0, units: [] })
  /** True while a scanned serial is being looked up. */
  const isLooking = ref(false)
  /** True while a step run is being sent. */
  const isRecording = ref(false)
  /** The unit as it can be worked here: scanned, and not refused. */
  const workable = computed(() =>
    current.value && !current.value.refusal && current.value.step ? current.value : null,
  )

  /** Fetches the active stations; throws ApiError. */
  async function fetchStations() {
    const all = await stationsApi.list()
    stations.value = all.filter((s) => s.isActive).sort((a, b) => a.code.localeCompare(b.code))
    return stations.value
  }

  /** Opens a station: its record and its recent runs. Unknown codes leave `station` null. */
  async function enter(code: string) {
    stationCode.value = code.trim().toUpperCase()
    current.value = null
    recent.value = []
    waiting.value = { total: 0, units: [] }
    const all = await fetchStations()
    station.value = all.find((s) => s.code === stationCode.value) ?? null
    if (station.value) await fetchRecent()
  }

  /** Refreshes the recent and the waiting lists; throws ApiError. */
  async function fetchRecent() {
    const [runs, queue] = await Promise.all([
      floorApi.recent(stationCode.value),
      floorApi.waiting(stationCode.value),
    ])
    recent.value = runs
    waiting.value = queue
  }

  /** Looks a scanned serial up at this station; throws ApiError (404, 400 mistyped). */
  async function scan(serial: string) {
    current.value = await whileLoading(isLooking, () => floorApi.unit(serial, stationCode.value))
    return current.value
  }

  /** Forgets the scanned unit, e.g. when the operator moves on. */
  function clearUnit() {
    current.value = null
  }

  /** Whether a component lot may be fitted on a BOM line of the current step. */
  function checkComponentLot(code: string, bomLineId: string) {
    return floorApi.componentLot(code, bomLineId)
  }

  /** Records a step run, then clears the unit and refreshes the recent list. */
  async function record(input: StepRunInput): Promise<StepRunResultDto> {
    return whileLoading(isRecording, async () => {
      const result = await floorApi.recordStepRun(input)
      current.value = null
      // The run is stored; a failed refresh of the list must not read as a failed record.
      await fetchRecent().catch(() => undefined)
      return result
    })
  }

  return {
    stationCode,
    station,
    stations,
    current,
    recent,
    waiting,
    isLooking,
    isRecording,
    workable,
    fetchStations,
    enter,
    fetchRecent,
    scan,
    clearUnit,
    checkComponentLot,
    record,
  }
})
