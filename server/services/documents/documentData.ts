import type { DocumentData, Progress, RenderedKind } from '../../documents/renderers'
import { env } from '../../env'
import type { Document } from '../../models'
import { certificateData, packingSlipData } from './customerPaperData'
import { labelSheetData, travelerData } from './lotPrintData'
import { loadLotReportData } from './lotReportData'

/** A document's data for its renderer, and the progress the render reports through. */
export interface LoadedDocument {
  input: DocumentData
  progress: Progress
}

/**
 * In tests only, a pause after each page (WAYMARK_TEST_RENDER_PAUSE_MS), so that a fault test can
 * kill a worker while its render is half done and see the job run again.
 */
function withTestPause(progress: Progress): Progress {
  const pauseMs = env.isTest ? env.WAYMARK_TEST_RENDER_PAUSE_MS : 0
  if (!pauseMs) return progress
  return async (fraction) => {
    await progress(fraction)
    if (fraction < 1) await new Promise((resolve) => setTimeout(resolve, pauseMs))
  }
}

/**
 * Reads what a document of a rendered kind prints. Loading the lot report's figures and the
 * packing slip's rows takes a visible share of the job, so those report it before drawing.
 */
export async function loadDocumentData(
  doc: Document,
  kind: RenderedKind,
  progress: Progress,
): Promise<LoadedDocument> {
  switch (kind) {
    case 'travelers':
      return {
        input: { kind: 'travelers', data: await travelerData(doc) },
        progress: withTestPause(progress),
      }
    case 'labels':
      return { input: { kind: 'labels', data: await labelSheetData(doc) }, progress }
    case 'lot_report': {
      const data = await loadLotReportData(doc.lotId!)
      await progress(0.1)
      return { input: { kind: 'lot_report', data }, progress: (f) => progress(0.1 + 0.9 * f) }
    }
    case 'certificate':
      return { input: { kind: 'certificate', data: await certificateData(doc) }, progress }
    case 'packing_slip': {
      const data = await packingSlipData(doc)
      await progress(0.2)
      return { input: { kind: 'packing_slip', data }, progress }
    }
  }
}
