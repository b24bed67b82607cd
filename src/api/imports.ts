import type { ImportMapping } from '@shared/imports'
import type {
  ImportDto,
  ImportMappingDto,
  ImportRowsDto,
  ImportRowsQuery,
  ImportRunInput,
} from '@shared/schemas/imports'
import { ApiError, json, request } from './client'
import { toSearchParams } from './query'

const importPath = (id: string, rest = '') => `/imports/${encodeURIComponent(id)}${rest}`

/** What the server's size and type refusals mean to the person uploading. */
const UPLOAD_REFUSALS: Record<number, string> = {
  413: 'The file is larger than 20 MB. Split the rack’s run into smaller files and try again.',
  415: 'That is not a text (CSV) file. Export the rack’s results as CSV and try again.',
}

export const importsApi = {
  /** The latest imports, newest first. */
  list: () => request<ImportDto[]>('/imports'),
  get: (id: string) => request<ImportDto>(importPath(id)),
  /**
   * Sends a rack's CSV (at most 20 MB) for a station.
   * @throws ApiError; 413 and 415 carry a message a person can act on
   */
  async upload(stationCode: string, file: File): Promise<ImportDto> {
    const body = new FormData()
    body.append('stationCode', stationCode)
    body.append('file', file, file.name)
    try {
      return await request<ImportDto>('/imports', { method: 'POST', body })
    } catch (err) {
      const refusal = err instanceof ApiError ? UPLOAD_REFUSALS[err.status] : undefined
      throw refusal && err instanceof ApiError
        ? new ApiError(err.status, err.code, refusal, err.fields)
        : err
    }
  },
  rows: (id: string, query: Partial<ImportRowsQuery>) =>
    request<ImportRowsDto>(importPath(id, `/rows?${toSearchParams(query)}`)),
  /**
   * Asks for the dry run with the station's saved mapping (202); a job plans the rows while the
   * import is `checking`, and writes no step run.
   */
  dryRun: (id: string) => request<ImportDto>(importPath(id, '/dry-run'), json('POST')),
  /** Queues the import job; 400 `defectCodeId` when failing rows need a defect code. */
  run: (id: string, input: ImportRunInput) =>
    request<ImportDto>(importPath(id, '/run'), json('POST', input)),
  mapping: (stationCode: string) =>
    request<ImportMappingDto>(`/stations/${encodeURIComponent(stationCode)}/import-mapping`),
  saveMapping: (stationCode: string, mapping: ImportMapping) =>
    request<ImportMappingDto>(
      `/stations/${encodeURIComponent(stationCode)}/import-mapping`,
      json('PUT', mapping),
    ),
}
