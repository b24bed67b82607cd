import type { DocumentKind } from '../../../shared/lots'
import { certificatePdf } from '../certificate'
import { labelSheetPdf } from '../labelSheet'
import { lotReportPdf } from '../lotReport'
import { packingSlipPdf } from '../packingSlip'
import { travelersPdf } from '../travelers'
import type { DocumentData, Progress, RenderedKind } from './types'

export type { DocumentData, DocumentDataByKind, Progress, RenderedKind } from './types'

/**
 * The kinds that have a renderer (the record makes the compiler ask for each one). A kind
 * without one fails its job with a clear reason rather than hanging in `queued`; add it here,
 * to `DocumentDataByKind` and to the service's loader when a new kind gets its PDF.
 */
const RENDERED_KINDS: Record<RenderedKind, true> = {
  travelers: true,
  labels: true,
  lot_report: true,
  certificate: true,
  packing_slip: true,
}

/** Whether documents of this kind have a renderer. */
export function isRenderedKind(kind: DocumentKind): kind is RenderedKind {
  return Object.hasOwn(RENDERED_KINDS, kind)
}

/**
 * Makes the PDF of one document from its data. Renderers are deterministic for the same data,
 * so a job run twice stores the same object (files are keyed by their sha256).
 */
export async function renderDocumentPdf(input: DocumentData, progress: Progress): Promise<Buffer> {
  switch (input.kind) {
    case 'travelers':
      return travelersPdf(input.data, progress)
    case 'labels':
      return labelSheetPdf(input.data, progress)
    case 'lot_report':
      return lotReportPdf(input.data, progress)
    case 'certificate':
      return certificatePdf(input.data, progress)
    case 'packing_slip':
      return packingSlipPdf(input.data, progress)
  }
}
