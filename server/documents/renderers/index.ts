import type { DocumentKind } from '../../../shared/lots'
import { renderCertificate, renderPackingSlip } from './customerPapers'
import { renderLabels, renderTravelers } from './lotPrints'
import { renderLotReport } from './lotReport'
import type { DocumentRenderer } from './types'

/**
 * The renderer of each document kind. A kind without one fails its job with a clear reason
 * rather than hanging in `queued`; add a line here when a new kind gets its PDF.
 */
export const RENDERERS: Partial<Record<DocumentKind, DocumentRenderer>> = {
  travelers: renderTravelers,
  labels: renderLabels,
  lot_report: renderLotReport,
  certificate: renderCertificate,
  packing_slip: renderPackingSlip,
}
