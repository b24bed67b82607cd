import type {
  StationCreateInput,
  StationDto,
  StationUpdateInput,
} from '../../../shared/schemas/stations'
import { Station } from '../../models'
import { auditCreated, conflictOnDuplicate, findOr404, updateAudited } from '../audit'
import type { Actor } from '../audit'
import { pickFields } from '../presenters'
import { withTransaction } from '../../db/sql'

function toStationDto(s: Station): StationDto {
  return {
    ...pickFields(s, ['id', 'code', 'name', 'kind', 'isActive']),
    createdAt: s.createdAt.toISOString(),
    updatedAt: s.updatedAt.toISOString(),
  }
}

const duplicateCode = conflictOnDuplicate('another station has this code', {
  code: 'already in use',
})

/** Every station, ordered by code. */
export async function listStations(): Promise<StationDto[]> {
  return (await Station.findAll({ order: [['code', 'ASC']] })).map(toStationDto)
}

/** Adds a station; its code is unique. */
export async function createStation(input: StationCreateInput, actor: Actor): Promise<StationDto> {
  return withTransaction(async (transaction) => {
    const station = await Station.create(input, { transaction })
    return auditCreated(actor, 'station.create', station.id, toStationDto(station), transaction)
  }).catch(duplicateCode)
}

/** Changes a station's code, name, kind or active flag. */
export async function updateStation(
  id: string,
  input: StationUpdateInput,
  actor: Actor,
): Promise<StationDto> {
  return withTransaction(async (transaction) => {
    const station = await findOr404(Station, id, 'station', transaction, true)
    return updateAudited(actor, 'station.update', station, input, toStationDto, transaction)
  }).catch(duplicateCode)
}
