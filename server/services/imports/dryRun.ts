import { Import, ImportMapping as ImportMappingModel, ImportRow, Station } from '../../models'
import { withTransaction } from '../../db/sql'
import { AppError } from '../../errors'
import { recordAudit } from '../admin'
import type { Actor } from '../admin'
import { progressReporter } from './importJobs'
import { CHUNK, loadImport } from './loadImport'
import { toMapping } from './mappings'
import { planRows } from './planRows'
import { readTable } from './uploadBenchFile'

// The dry run: asked for on the screen, then done by a job that plans every row of the file
// and stores the plan, so the import records exactly what the screen showed.

/**
 * Asks for the dry run: checks that the station's saved mapping fits the file, then the import
 * goes to `checking` with that mapping, in one transaction with its audit event. The job
 * (checkImport) plans the rows; the caller enqueues it, and the sweeper does if Redis is away.
 */
export async function requestDryRun(id: string, actor: Actor): Promise<Import> {
  return withTransaction(async (transaction) => {
    const imp = await loadImport(id, transaction, true)
    if (imp.status === 'checking')
      throw AppError.conflict('import_checking', 'this file is being checked; wait for the rows')
    if (!['uploaded', 'checked'].includes(imp.status))
      throw AppError.conflict(
        'import_started',
        'this file’s import has already started; upload the file again to check it anew',
      )
    const station = (await Station.findByPk(imp.stationId, { transaction }))!
    const saved = await ImportMappingModel.findByPk(station.id, { transaction })
    if (!saved)
      throw AppError.conflict(
        'no_mapping',
        `save the column mapping of ${station.code} first: which column holds the serial and each check`,
      )
    const mapping = toMapping(saved)
    const missing = [mapping.serialColumn, mapping.timeColumn, mapping.operatorColumn]
      .concat(Object.values(mapping.checkColumns))
      .filter((c): c is string => c !== null && !imp.columns.includes(c))
    if (missing.length)
      throw AppError.badRequest(
        `mapping: this file has no column "${missing[0]}"; adjust the mapping of ${station.code}`,
        { mapping: `no column ${missing[0]}` },
      )
    await imp.update({ status: 'checking', mapping, progress: 0, error: null }, { transaction })
    await recordAudit(
      actor,
      { action: 'import.dry_run', entity: 'import', entityId: id, after: { mapping } },
      transaction,
    )
    return imp
  })
}

/** The share of a dry run's progress bar that planning the rows fills; storing them fills the rest. */
const PLANNED_SHARE = 80

/** Rolls a dry run's stored rows back: the import stopped checking while they were written. */
class NoLongerChecking extends Error {}

/**
 * The dry run's job: plans every row with the mapping the request kept and stores the plan
 * (replacing an earlier dry run's), so the import runs exactly what was shown. Writes no step
 * run. Safe to run twice: an import no longer `checking` is left as it is.
 */
export async function checkImport(
  id: string,
  onProgress: (percent: number) => Promise<void> = async () => {},
): Promise<void> {
  const first = await Import.findByPk(id)
  if (first?.status !== 'checking' || !first.mapping) return
  const station = (await Station.findByPk(first.stationId))!
  const report = progressReporter(first, onProgress)
  // Planning the rows is most of the work; storing them the rest.
  const rows = await planRows(
    await readTable(first),
    first.mapping,
    station,
    first.sha256,
    first.id,
    (done, total) => report((done / total) * PLANNED_SHARE),
  )
  await report(PLANNED_SHARE)
  const ready = rows.filter((r) => r.errors.length === 0).length
  const isStored = await withTransaction(async (transaction) => {
    // The import is locked only at the end, so the progress written meanwhile (outside this
    // transaction) never waits for it; a dry run no longer wanted is rolled back then.
    await ImportRow.destroy({ where: { importId: id }, transaction })
    for (let i = 0; i < rows.length; i += CHUNK) {
      await ImportRow.bulkCreate(rows.slice(i, i + CHUNK), { transaction })
      await report(PLANNED_SHARE + ((i + CHUNK) / rows.length) * (100 - PLANNED_SHARE))
    }
    const imp = await loadImport(id, transaction, true)
    if (imp.status !== 'checking') throw new NoLongerChecking()
    await imp.update(
      {
        status: 'checked',
        progress: 0,
        readyCount: ready,
        errorCount: rows.length - ready,
        checkedAt: new Date(),
      },
      { transaction },
    )
    return true
  }).catch((err: unknown) => {
    if (err instanceof NoLongerChecking) return false
    throw err
  })
  if (isStored) await onProgress(100)
}
