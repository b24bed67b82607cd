import { IMPORT_MAX_BYTES } from '../../../shared/imports'
import type { ImportDto } from '../../../shared/schemas/imports'
import { AppError } from '../../errors'
import { Import, Upload } from '../../models'
import { withTransaction } from '../../db/sql'
import { getFile, putFile } from '../../storage'
import { auditAction } from '../admin'
import type { Actor } from '../admin'
import { safeFileName } from '../receiving'
import { assertText, parseBenchCsv } from './benchCsv'
import type { BenchTable } from './benchCsv'
import { toImportDto } from './importDto'
import { stationByCode } from './mappings'

// A rack's CSV file: taken in, stored under its sha256, and read back for the dry run.

/**
 * Takes a rack's CSV: checks it is text (415) of at most 20 MB (413), parses it, stores the file
 * under its sha256 and records the upload and the import, audited. Nothing is checked against
 * units yet; that is the dry run.
 */
export async function uploadBenchFile(
  file: { buffer: Buffer; originalname: string } | undefined,
  stationCode: string,
  actor: Actor,
): Promise<ImportDto> {
  if (!file)
    throw AppError.badRequest('file: attach the CSV file as the form field "file"', {
      file: 'attach a file',
    })
  if (file.buffer.length > IMPORT_MAX_BYTES)
    throw AppError.tooLarge('file: the file is over 20 MB; split the run into smaller files')
  const station = await stationByCode(stationCode)
  const table = parseBenchCsv(await assertText(file.buffer))
  const stored = await putFile('imports', file.buffer, 'text/csv')
  const filename = safeFileName(file.originalname, 'bench.csv')
  const imp = await withTransaction(async (transaction) => {
    const upload = await Upload.create(
      {
        storageKey: stored.key,
        sha256: stored.sha256,
        filename,
        contentType: 'text/csv',
        size: stored.size,
        uploadedBy: actor.id,
      },
      { transaction },
    )
    const created = await Import.create(
      {
        stationId: station.id,
        uploadId: upload.id,
        sha256: stored.sha256,
        filename,
        columns: table.columns,
        rowCount: table.rows.length,
        createdBy: actor.id!,
      },
      { transaction },
    )
    await auditAction(
      actor,
      'import.upload',
      created.id,
      {
        after: {
          station: station.code,
          filename,
          sha256: stored.sha256,
          rows: table.rows.length,
        },
      },
      transaction,
    )
    return created
  })
  return toImportDto(imp)
}

/** The import's file read back from storage and parsed, as it was when uploaded. */
export async function readTable(imp: Import): Promise<BenchTable> {
  const upload = (await Upload.findByPk(imp.uploadId))!
  const file = await getFile(upload.storageKey)
  return parseBenchCsv(await assertText(file.body))
}
