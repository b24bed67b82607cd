import type { ExportFormat } from '@shared/schemas/exports'
import { toSearchParams } from './query'

/** Download addresses of the spreadsheet exports (the browser fetches them with the session). */
export const exportsApi = {
  /** The lots table of the Yield board for a period, optionally of one product or revision. */
  lotsUrl: (
    format: ExportFormat,
    filter: { from: string; to: string; productId?: string; revisionId?: string },
  ) => `/api/exports/lots?${toSearchParams({ format, ...filter }).toString()}`,
  /** Every step run of one lot with its readings, one column per check. */
  lotMeasurementsUrl: (lotId: string, format: ExportFormat) =>
    `/api/exports/lots/${encodeURIComponent(lotId)}/measurements?format=${format}`,
}
