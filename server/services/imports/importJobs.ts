import { Op } from 'sequelize'
import { Import } from '../../models'
import { select } from '../../db/sql'
import { logger } from '../../logger'

// The bookkeeping of an import's jobs (the dry run and the import): progress, counts, a job
// that gave up, and the imports whose job the sweeper enqueues again.

/**
 * Reports a job's progress to its imports row (which the screen polls) and to the job: at most
 * one write every 2 %, never backwards, and below 100 until the caller says it is done.
 */
export function progressReporter(imp: Import, onProgress: (percent: number) => Promise<void>) {
  let last = -1
  return async (percent: number) => {
    const rounded = Math.min(99, Math.floor(percent))
    if (rounded < last + 2) return // a write every 2 % is plenty for a progress bar
    last = rounded
    await imp.update({ progress: rounded })
    await onProgress(rounded)
  }
}

/** Recounts an import's recorded, repeated and refused rows from the outcomes written. */
export async function refreshCounts(imp: Import): Promise<void> {
  const rows = await select<{ outcome: string; n: string }>(
    `SELECT outcome, count(*) AS n FROM import_rows WHERE import_id = :id AND outcome IS NOT NULL GROUP BY outcome`,
    { replacements: { id: imp.id } },
  )
  const n = (o: string) => Number(rows.find((r) => r.outcome === o)?.n ?? 0)
  await imp.update({
    recordedCount: n('recorded'),
    skippedCount: n('repeat'),
    failedCount: n('refused'),
  })
}

/** Marks an import stopped after its job's last attempt, with the reason for the screen. */
export async function failImport(id: string, reason: string): Promise<void> {
  const imp = await Import.findByPk(id)
  if (!imp || imp.status === 'done') return
  const error = reason.slice(0, 500)
  // A dry run that could not finish leaves the file as it was, to be checked again.
  if (imp.status === 'checking') {
    await imp.update({ status: imp.checkedAt ? 'checked' : 'uploaded', progress: 0, error })
    return
  }
  await refreshCounts(imp)
  await imp.update({ status: 'failed', error })
}

/** An import whose job the sweeper enqueues again: its dry run, or its import. */
export interface PendingImport {
  id: string
  kind: 'check' | 'run'
  /** Part of the check job's id, so a new dry run of the same file gets a job of its own. */
  updatedAt: Date
}

/** Imports still waiting after `olderThanMs`, which the sweeper enqueues again. */
export async function pendingImports(now: Date, olderThanMs: number): Promise<PendingImport[]> {
  const rows = await Import.findAll({
    // A `running` row untouched for ten minutes lost its worker; queued and checking ones
    // lost their job (or are slow: the job ids make a second enqueue of the same one a no-op).
    where: {
      [Op.or]: [
        {
          status: { [Op.in]: ['queued', 'checking'] },
          updatedAt: { [Op.lt]: new Date(now.getTime() - olderThanMs) },
        },
        { status: 'running', updatedAt: { [Op.lt]: new Date(now.getTime() - 10 * 60_000) } },
      ],
    },
    attributes: ['id', 'status', 'updatedAt'],
    limit: 500,
  })
  if (rows.length)
    logger.info({ count: rows.length }, 'imports found waiting; enqueueing them again')
  return rows.map((r) => ({
    id: r.id,
    kind: r.status === 'checking' ? 'check' : 'run',
    updatedAt: r.updatedAt,
  }))
}
