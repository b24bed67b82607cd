import { UniqueConstraintError } from 'sequelize'
import type {
  StationCreateInput,
  StationDto,
  StationUpdateInput,
} from '../../../shared/schemas/stations'
import { AppError } from '../../errors'
import { Station } from '../../models'
import { changedFields, recordAudit } from '../audit'
import type { Actor } from '../audit'
import { withTransaction } from '../../db/sql'

function toStationDto(s: Station): StationDto {
  return {
    id: s.id,
    code: s.code,
    name: s.name,
    kind: s.kind,
    isActive: s.isActive,
    createdAt: s.createdAt.toISOString(),
    updatedAt: s.updatedAt.toISOString(),
  }
}

function duplicateCode(err: unknown): never {
  if (err instanceof UniqueConstraintError)
    throw AppError.conflict('duplicate', 'another station has this code', {
      code: 'already in use',
    })
  throw err
}

/** Every station, ordered by code. */
export async function listStations(): Promise<StationDto[]> {
  return (await Station.findAll({ order: [['code', 'ASC']] })).map(toStationDto)
}

/** Adds a station; its code is unique. */
export async function createStation(input: StationCreateInput, actor: Actor): Promise<StationDto> {
  return withTransaction(async (transaction) => {
    const station = await Station.create(input, { transaction })
    const dto = toStationDto(station)
    await recordAudit(
      actor,
      { action: 'station.create', entity: 'station', entityId: station.id, after: dto },
      transaction,
    )
    return dto
  }).catch(duplicateCode)
}

/** Changes a station's code, name, kind or active flag. */
export async function updateStation(
  id: string,
  input: StationUpdateInput,
  actor: Actor,
): Promise<StationDto> {
  return withTransaction(async (transaction) => {
    const station = await Station.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!station) throw AppError.notFound(`station ${id}`)
    const before = toStationDto(station)
    await station.update(input, { transaction })
    const after = toStationDto(station)
    const { before: b, after: a } = changedFields(before, after)
    await recordAudit(
      actor,
      { action: 'station.update', entity: 'station', entityId: id, before: b, after: a },
      transaction,
    )
    return after
  }).catch(duplicateCode)
}
