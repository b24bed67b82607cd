import type { Document } from '../../models'
import { loadLotReportData } from '../../services/documents'
import { lotReportPdf } from '../lotReport'
import type { Progress } from './types'

/** The lot report of the document's lot, with its figures as of the lot's latest activity. */
export async function renderLotReport(doc: Document, progress: Progress): Promise<Buffer> {
  const data = await loadLotReportData(doc.lotId!)
  await progress(0.1)
  return lotReportPdf(data, (f) => progress(0.1 + 0.9 * f))
}
