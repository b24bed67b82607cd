import type { DefectCodeDto, DefectCodeInput } from '../../../shared/schemas/recipes'
import { DefectCode } from '../../models'
import { auditCreated, conflictOnDuplicate, findOr404, updateAudited } from '../admin'
import type { Actor } from '../admin'
import { pickFields } from '../presenters'
import { withTransaction } from '../../db/sql'

function toDto(d: DefectCode): DefectCodeDto {
  return pickFields(d, ['id', 'code', 'description', 'stationKinds', 'isActive'])
}

const duplicateCode = conflictOnDuplicate('another defect code has this code', {
  code: 'already in use',
})

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
    return auditCreated(actor, 'defect_code.create', row.id, toDto(row), transaction)
  }).catch(duplicateCode)
}

/** Changes a defect code; retire one with `isActive: false` rather than deleting history. */
export async function updateDefectCode(
  id: string,
  input: Partial<DefectCodeInput>,
  actor: Actor,
): Promise<DefectCodeDto> {
  return withTransaction(async (transaction) => {
    const row = await findOr404(DefectCode, id, 'defect code', transaction, true)
    return updateAudited(actor, 'defect_code.update', row, input, toDto, transaction)
  }).catch(duplicateCode)
}
