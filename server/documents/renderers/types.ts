import type { CertificateData } from '../certificate'
import type { LabelSheetData } from '../labelSheet'
import type { LotReportData } from '../lotReportTypes'
import type { PackingSlipData } from '../packingSlip'
import type { TravelerData } from '../travelers'

/** Reports how far a render has got, as a fraction from 0 to 1. */
export type Progress = (fraction: number) => Promise<void>

/**
 * What each kind of document with a PDF renderer prints. The documents service loads it
 * (server/services/documents/documentData.ts); the renderers only draw it.
 */
export interface DocumentDataByKind {
  travelers: TravelerData
  labels: LabelSheetData
  lot_report: LotReportData
  certificate: CertificateData
  packing_slip: PackingSlipData
}

/** A document kind that has a renderer. */
export type RenderedKind = keyof DocumentDataByKind

/** One document's data, tagged with its kind. */
export type DocumentData = {
  [K in RenderedKind]: { kind: K; data: DocumentDataByKind[K] }
}[RenderedKind]
