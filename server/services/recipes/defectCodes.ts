import { UniqueConstraintError } from 'sequelize'
import type { DefectCodeDto, DefectCodeInput } from '../../../shared/schemas/recipes'
import { AppError } from '../../errors'
import { DefectCode } from '../../models'
import { changedFields, recordAudit } from '../admin'
import type { Actor } from '../admin'
import { withTransaction } from '../../db/sql'

function toDto(d: DefectCode): DefectCodeDto {
  return {
    id: d.id,
    code: d.code,
    description: d.description,
    stationKinds: d.stationKinds,
    isActive: d.isActive,
  }
}

function duplicateCode(err: unknown): never {
  if (err instanceof UniqueConstraintError)
    throw AppError.conflict('duplicate', 'another defect code has this code', {
      code: 'already in use',
    })
  throw err
}

/** Every defect code, by code. */
export async function listDefectCodes(): Promise<DefectCodeDto[]> {
  return (await DefectCode.findAll({ order: [['code', 'ASC']] })).map(toDto)
}

/** Adds a defect code. */
export async function createDefectCode(
  input: DefectCodeInput,
  actor: Actor,
): Promise<DefectCodeDto> {
  return withTransaction(async (transaction) => {
    const row = await DefectCode.create(input, { transaction })
    const dto = toDto(row)
    await recordAudit(
      actor,
      { action: 'defect_code.create', entity: 'defect_code', entityId: row.id, after: dto },
      transaction,
    )
    return dto
  }).catch(duplicateCode)
}

/** Changes a defect code; retire one with `isActive: false` rather than deleting history. */
export async function updateDefectCode(
  id: string,
  input: Partial<DefectCodeInput>,
  actor: Actor,
): Promise<DefectCodeDto> {
  return withTransaction(async (transaction) => {
    const row = await DefectCode.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!row) throw AppError.notFound(`defect code ${id}`)
    const before = toDto(row)
    await row.update(input, { transaction })
    const after = toDto(row)
    await recordAudit(
      actor,
      {
        action: 'defect_code.update',
        entity: 'defect_code',
        entityId: id,
        ...changedFields(before, after),
      },
      transaction,
    )
    return after
  }).catch(duplicateCode)
}
