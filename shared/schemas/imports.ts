import { z } from 'zod'
import { text } from './common'
import type { ImportMapping, ImportRowOutcome, ImportStatus } from '../imports'
import type { StationKind } from '../stations'
import type { Unit } from '../units'
import type { CheckKind } from '../recipeDefinitions'

const column = (what: string) =>
  text()
    .trim()
    .min(1, `choose the ${what} column`)
    .max(200, 'a column name is at most 200 characters')

export const ImportMappingInput = z.object({
  serialColumn: column('serial'),
  timeColumn: column('time').nullable().default(null),
  operatorColumn: column('operator').nullable().default(null),
  checkColumns: z
    .record(text().trim().min(1).max(40), column('check'))
    .default({})
    .refine((m) => Object.keys(m).length <= 100, 'at most 100 checks'),
}) satisfies z.ZodType<ImportMapping>
export type ImportMappingInput = z.infer<typeof ImportMappingInput>

export const ImportCreateInput = z.object({
  stationCode: text().trim().toUpperCase().min(1, 'which station?').max(16),
})

export const ImportRunInput = z.object({
  /** The defect code given to rows that fail a check; needed only when some good row fails. */
  defectCodeId: text().uuid('choose a defect code').nullable().default(null),
})
export type ImportRunInput = z.infer<typeof ImportRunInput>

export const ImportRowsQuery = z.object({
  show: z.enum(['all', 'errors', 'ready', 'refused']).default('all'),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(100),
})
export type ImportRowsQuery = z.infer<typeof ImportRowsQuery>

// --- what the API returns ---------------------------------------------------------------

/** A check a station's files may fill: a typed (not derived) check of a released step. */
export interface ImportCheckDto {
  key: string
  label: string
  kind: CheckKind
  unit: Unit | null
  /** The steps (by name) that have this check, for the person choosing columns. */
  steps: string[]
}

export interface ImportMappingDto {
  stationCode: string
  stationName: string
  stationKind: StationKind
  /** The saved mapping, or null when this station has none yet. */
  saved: (ImportMapping & { updatedAt: string }) | null
  checks: ImportCheckDto[]
}

export interface ImportDto {
  id: string
  stationCode: string
  stationName: string
  stationKind: StationKind
  filename: string
  sha256: string
  size: number
  columns: string[]
  rowCount: number
  status: ImportStatus
  progress: number
  mapping: ImportMapping | null
  /** A mapping to start from: the station's saved one, else a guess from the column names. */
  proposedMapping: ImportMapping
  hasSavedMapping: boolean
  counts: {
    ready: number
    errors: number
    /** Ready rows that fail a check: they need a defect code to import. */
    failing: number
    recorded: number
    skipped: number
    refused: number
  }
  /** Earlier imports of a file with the same content. */
  sameFileImports: { id: string; createdAt: string; status: ImportStatus }[]
  defectCodeId: string | null
  error: string | null
  createdBy: string
  createdAt: string
  checkedAt: string | null
  finishedAt: string | null
}

export interface ImportRowCheckDto {
  key: string
  label: string
  unit: Unit | null
  /** The cell as the file has it; null for a derived value. */
  cell: string | null
  value: number | boolean | string | null
  lower: number | null
  upper: number | null
  verdict: 'pass' | 'fail' | 'missing'
  isDerived: boolean
}

export interface ImportRowDto {
  rowNumber: number
  serial: string
  stepName: string | null
  benchTime: string | null
  benchOperator: string | null
  checks: ImportRowCheckDto[]
  result: 'pass' | 'fail' | null
  errors: string[]
  outcome: ImportRowOutcome | null
  outcomeMessage: string | null
}

export interface ImportRowsDto {
  rows: ImportRowDto[]
  total: number
}
