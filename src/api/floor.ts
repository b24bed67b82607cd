import type {
  FloorComponentLotDto,
  FloorUnitDto,
  RecentRunDto,
  StepRunInput,
  StepRunResultDto,
  UnitWhereDto,
  WaitingUnitsDto,
} from '@shared/schemas/lots'
import { json, request } from './client'

const enc = encodeURIComponent

export const floorApi = {
  /**
   * What a station needs after a scan. A unit that cannot be worked here comes back with
   * `refusal` set; 404 `unknown_serial` and 400 `mistyped_serial` carry a message to show.
   */
  unit: (serial: string, stationCode: string) =>
    request<FloorUnitDto>(`/floor/units/${enc(serial)}?station=${enc(stationCode)}`),
  /** Whether a scanned component lot may be fitted on a BOM line; `refusal` says why not. */
  componentLot: (code: string, bomLineId: string) =>
    request<FloorComponentLotDto>(`/floor/component-lots/${enc(code)}?bomLineId=${enc(bomLineId)}`),
  /** The last 20 step runs at a station, newest first. */
  recent: (stationCode: string) =>
    request<RecentRunDto[]>(`/floor/stations/${enc(stationCode)}/recent`),
  /** The units whose next step is worked at this station, oldest first (at most 30, and a count). */
  waiting: (stationCode: string) =>
    request<WaitingUnitsDto>(`/floor/stations/${enc(stationCode)}/waiting`),
  /** Where a unit waits: its next step and the stations that work it. 404 for an unknown serial. */
  where: (serial: string) => request<UnitWhereDto>(`/floor/units/${enc(serial)}/where`),
  /**
   * Records one step run. The same `clientEventId` sent again answers 200 with the stored run,
   * so a retry after a lost answer never records twice. 409 tells the operator what to do;
   * 400 names the fields (`values.<key>`, `consumptions.<n>.code`).
   */
  recordStepRun: (input: StepRunInput) =>
    request<StepRunResultDto>('/step-runs', json('POST', input)),
}
