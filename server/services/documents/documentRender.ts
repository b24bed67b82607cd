import { Op } from 'sequelize'
import { isRenderedKind, renderDocumentPdf } from '../../documents/renderers'
import { logger } from '../../logger'
import { Document } from '../../models'
import { putFile } from '../../storage'
import { loadDocumentData } from './documentData'

/**
 * Makes one document's PDF and stores it: its data is read here (documentData.ts) and drawn by
 * the renderers in server/documents/, which never read the database. Safe to run twice: a
 * finished document is left as it is, and the renderers are deterministic for a lot, so a rerun
 * writes the same object (files are keyed by their sha256) rather than a second one.
 */
export async function renderDocument(
  id: string,
  onProgress: (percent: number) => Promise<void>,
  /** When it was made, if not now: the demo seed's clock. */
  at?: Date,
): Promise<void> {
  const doc = await Document.findByPk(id)
  if (!doc) throw new Error(`document ${id} does not exist`)
  if (doc.status === 'done') return
  const kind = doc.kind
  if (!isRenderedKind(kind)) throw new Error(`no renderer for documents of kind ${kind}`)
  await doc.update({ status: 'running', progress: 0, error: null })
  let last = -1
  const progress = async (fraction: number) => {
    const percent = Math.min(99, Math.floor(fraction * 100))
    if (percent < last + 5 && fraction < 1) return // a write every 5 % is plenty for a progress bar
    last = percent
    await doc.update({ progress: percent })
    await onProgress(percent)
  }
  const loaded = await loadDocumentData(doc, kind, progress)
  const pdf = await renderDocumentPdf(loaded.input, loaded.progress)
  const stored = await putFile('documents', pdf, 'application/pdf')
  await doc.update({
    status: 'done',
    progress: 100,
    storageKey: stored.key,
    sha256: stored.sha256,
    size: stored.size,
    finishedAt: at ?? new Date(),
  })
  await onProgress(100)
}

/** Marks a document failed after its last attempt, with the reason for the lot page. */
export async function failDocument(id: string, reason: string): Promise<void> {
  await Document.update(
    { status: 'failed', error: reason.slice(0, 500) },
    { where: { id, status: { [Op.ne]: 'done' } } },
  )
}

/** Documents still waiting after `olderThanMs`, which the sweeper enqueues again. */
export async function pendingDocumentIds(now: Date, olderThanMs: number): Promise<string[]> {
  const rows = await Document.findAll({
    // A `running` row untouched for ten minutes lost its worker; queued ones lost their job.
    where: {
      [Op.or]: [
        { status: 'queued', updatedAt: { [Op.lt]: new Date(now.getTime() - olderThanMs) } },
        { status: 'running', updatedAt: { [Op.lt]: new Date(now.getTime() - 10 * 60_000) } },
      ],
    },
    attributes: ['id'],
    limit: 500,
  })
  if (rows.length)
    logger.info({ count: rows.length }, 'documents found waiting; enqueueing them again')
  return rows.map((r) => r.id)
}
