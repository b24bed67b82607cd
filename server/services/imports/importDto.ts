import { Op } from 'sequelize'
import type { WhereOptions } from 'sequelize'
import { proposeMapping } from '../../../shared/imports'
import type {
  ImportDto,
  ImportRowDto,
  ImportRowsDto,
  ImportRowsQuery,
} from '../../../shared/schemas/imports'
import {
  db,
  Import,
  ImportMapping as ImportMappingModel,
  ImportRow,
  Station,
  Upload,
  User,
} from '../../models'
import { loadImport, readyWhere } from './loadImport'
import { stationChecks, toMapping } from './mappings'
import { pickFields } from '../presenters'

// What the import screen shows: an import with its counts and the mapping it would use, the
// latest imports, and a page of an import's rows.

/** An import as the screen shows it, with the mapping proposed for it and its counts. */
export async function toImportDto(imp: Import): Promise<ImportDto> {
  const station = (await Station.findByPk(imp.stationId))!
  const upload = (await Upload.findByPk(imp.uploadId))!
  const saved = await ImportMappingModel.findByPk(imp.stationId)
  const creator = await User.findByPk(imp.createdBy, { attributes: ['name'] })
  const proposed = saved
    ? toMapping(saved)
    : proposeMapping(imp.columns, await stationChecks(station))
  const failing = imp.checkedAt
    ? await ImportRow.count({ where: { ...readyWhere(imp.id), result: 'fail' } })
    : 0
  const same = await Import.findAll({
    where: { sha256: imp.sha256, id: { [Op.ne]: imp.id } },
    order: [['createdAt', 'DESC']],
    limit: 5,
  })
  return {
    id: imp.id,
    stationCode: station.code,
    stationName: station.name,
    stationKind: station.kind,
    filename: imp.filename,
    sha256: imp.sha256,
    size: upload.size,
    columns: imp.columns,
    rowCount: imp.rowCount,
    status: imp.status,
    progress: imp.progress,
    mapping: imp.mapping,
    proposedMapping: proposed,
    hasSavedMapping: saved !== null,
    counts: {
      ready: imp.readyCount,
      errors: imp.errorCount,
      failing,
      recorded: imp.recordedCount,
      skipped: imp.skippedCount,
      refused: imp.failedCount,
    },
    sameFileImports: same.map((s) => ({
      id: s.id,
      createdAt: s.createdAt.toISOString(),
      status: s.status,
    })),
    defectCodeId: imp.defectCodeId,
    error: imp.error,
    createdBy: creator?.name ?? '',
    createdAt: imp.createdAt.toISOString(),
    checkedAt: imp.checkedAt?.toISOString() ?? null,
    finishedAt: imp.finishedAt?.toISOString() ?? null,
  }
}

export async function getImport(id: string): Promise<ImportDto> {
  return toImportDto(await loadImport(id))
}

/** The latest imports, newest first, for the screen's list. */
export async function listImports(): Promise<ImportDto[]> {
  const rows = await Import.findAll({ order: [['createdAt', 'DESC']], limit: 20 })
  return Promise.all(rows.map(toImportDto))
}

function toRowDto(r: ImportRow): ImportRowDto {
  return pickFields(r, [
    'rowNumber',
    'serial',
    'stepName',
    'benchTime',
    'benchOperator',
    'checks',
    'result',
    'errors',
    'outcome',
    'outcomeMessage',
  ])
}

/** A page of an import's rows in file order: all, only those with errors, only good ones. */
export async function listImportRows(id: string, q: ImportRowsQuery): Promise<ImportRowsDto> {
  await loadImport(id)
  const errorsLength = db().fn('jsonb_array_length', db().col('errors'))
  const where: WhereOptions<ImportRow> =
    q.show === 'errors'
      ? ({ importId: id, [Op.and]: [db().where(errorsLength, '>', 0)] } as WhereOptions<ImportRow>)
      : q.show === 'ready'
        ? readyWhere(id)
        : q.show === 'refused'
          ? { importId: id, outcome: 'refused' }
          : { importId: id }
  const { rows, count } = await ImportRow.findAndCountAll({
    where,
    order: [['rowNumber', 'ASC']],
    offset: (q.page - 1) * q.pageSize,
    limit: q.pageSize,
  })
  return { rows: rows.map(toRowDto), total: count }
}
