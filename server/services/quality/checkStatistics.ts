import { seriesStatistics } from '../../../shared/quality/spcSeries'
import type {
  CheckSeriesDto,
  LotStatisticsQuery,
  ProductStatisticsQuery,
  SeriesPointDto,
  StatisticsCheckDto,
  StatisticsDto,
} from '../../../shared/schemas/statistics'
import { STATISTICS_MAX_POINTS } from '../../../shared/schemas/statistics'
import type { Unit } from '../../../shared/units'
import { AppError } from '../../errors'
import { select } from '../../db/sql'

// Statistics on any numeric check (issue 20 point 4): the lot page and the lot report read one
// lot's series of a check; the Yield board reads a product's check, by key, across its lots
// and revisions in a period. One query lists the checks with their reading counts, one reads
// the picked series (every reading, retests included, in the order the runs finished); the
// chart, run rules and capability come from shared/quality/spcSeries.ts. Days are UTC, as on
// the rest of the board.

interface CheckRow {
  ref: string
  key: string
  label: string
  step_name: string
  step_position: number
  unit: Unit | null
  lower: number | null
  upper: number | null
  nominal: number | null
  decimals: number
  letter: string
  readings: string
}

interface PointRow {
  serial: string
  lot_number: string
  attempt: number
  finished_at: Date
  value: number
}

const toCheck = (r: CheckRow): StatisticsCheckDto => ({
  ref: r.ref,
  key: r.key,
  label: r.label,
  stepName: r.step_name,
  stepPosition: r.step_position,
  unit: r.unit,
  readings: Number(r.readings),
})

function seriesOf(check: CheckRow, rows: PointRow[], limitsFrom: string | null): CheckSeriesDto {
  // The query returns the latest readings first, one more than kept to tell a cut series.
  const isCut = rows.length > STATISTICS_MAX_POINTS
  const kept = rows.slice(0, STATISTICS_MAX_POINTS).reverse()
  const points: SeriesPointDto[] = kept.map((r, index) => ({
    index,
    serial: r.serial,
    lotNumber: r.lot_number,
    attempt: r.attempt,
    finishedAt: r.finished_at.toISOString(),
    value: Number(r.value),
  }))
  const { readings: _readings, ...meta } = toCheck(check)
  return {
    check: {
      ...meta,
      lower: check.lower,
      upper: check.upper,
      nominal: check.nominal,
      decimals: check.decimals,
    },
    limitsFrom,
    points,
    isCut,
    statistics: seriesStatistics(
      points.map((p) => p.value),
      { lower: check.lower ?? undefined, upper: check.upper ?? undefined },
    ),
  }
}

const CHECK_COLUMNS = `c.key, c.label, rs.name AS step_name, rs.position AS step_position,
  c.unit, c.lower, c.upper, c.nominal, c.decimals, r.letter`

/** The numeric checks of a lot's revision with their readings in the lot, in route order. */
async function lotChecks(lotId: string): Promise<CheckRow[]> {
  return select<CheckRow>(
    `SELECT c.id AS ref, ${CHECK_COLUMNS},
            (SELECT count(*) FROM measurements m
               JOIN step_runs sr ON sr.id = m.step_run_id
               JOIN units u ON u.id = sr.unit_id
              WHERE m.check_id = c.id AND u.lot_id = l.id AND m.value_number IS NOT NULL) AS readings
       FROM lots l
       JOIN revisions r ON r.id = l.revision_id
       JOIN checks c ON c.revision_id = l.revision_id AND c.kind = 'numeric'
       JOIN route_steps rs ON rs.id = c.step_id
      WHERE l.id = :lotId
      ORDER BY rs.position, c.position`,
    { replacements: { lotId } },
  )
}

/** One lot's numeric checks and, when `checkId` is given, that check's series and figures. */
export async function lotStatistics(
  lotId: string,
  query: LotStatisticsQuery = {},
): Promise<StatisticsDto> {
  const exists = await select<{ id: string }>('SELECT id FROM lots WHERE id = :lotId', {
    replacements: { lotId },
  })
  if (!exists.length) throw AppError.notFound(`lot ${lotId}`)
  const rows = await lotChecks(lotId)
  if (!query.checkId) return { checks: rows.map(toCheck), selected: null }
  const check = rows.find((r) => r.ref === query.checkId)
  if (!check)
    throw AppError.badRequest('checkId: not a numeric check of this lot', {
      checkId: 'not a numeric check of this lot',
    })
  return {
    checks: rows.map(toCheck),
    selected: await lotSeries(lotId, check),
  }
}

async function lotSeries(lotId: string, check: CheckRow): Promise<CheckSeriesDto> {
  const points = await select<PointRow>(
    `SELECT u.serial, l.number AS lot_number, sr.attempt, sr.finished_at, m.value_number AS value
       FROM measurements m
       JOIN step_runs sr ON sr.id = m.step_run_id
       JOIN units u ON u.id = sr.unit_id
       JOIN lots l ON l.id = u.lot_id
      WHERE m.check_id = :checkId AND u.lot_id = :lotId AND m.value_number IS NOT NULL
      ORDER BY sr.finished_at DESC, sr.id DESC
      LIMIT :limit`,
    { replacements: { checkId: check.ref, lotId, limit: STATISTICS_MAX_POINTS + 1 } },
  )
  return seriesOf(check, points, null)
}

/** The series of every numeric check of a lot that the engineer marked as key (lot report). */
export async function lotKeyCheckSeries(lotId: string): Promise<CheckSeriesDto[]> {
  const keys = await select<{ id: string }>(
    `SELECT c.id FROM lots l JOIN checks c ON c.revision_id = l.revision_id
      WHERE l.id = :lotId AND c.is_key AND c.kind = 'numeric'`,
    { replacements: { lotId } },
  )
  if (!keys.length) return []
  const rows = await lotChecks(lotId)
  const wanted = new Set(keys.map((k) => k.id))
  return Promise.all(rows.filter((r) => wanted.has(r.ref)).map((r) => lotSeries(lotId, r)))
}

/**
 * A product's numeric checks by key across the lots whose runs finished in the period and,
 * with `checkKey`, that check's series. Limits come from the newest revision with readings.
 */
export async function productStatistics(query: ProductStatisticsQuery): Promise<StatisticsDto> {
  const scope = {
    productId: query.productId,
    revisionId: query.revisionId ?? null,
    from: query.from,
    to: query.to,
  }
  // Per key, the newest revision's check (by letter) among those with readings in the period.
  const rows = await select<CheckRow>(
    `WITH readings AS (
       SELECT c.id AS check_id, count(*) AS n
         FROM revisions r
         JOIN checks c ON c.revision_id = r.id AND c.kind = 'numeric'
         JOIN measurements m ON m.check_id = c.id AND m.value_number IS NOT NULL
         JOIN step_runs sr ON sr.id = m.step_run_id
        WHERE r.product_id = :productId
          AND (CAST(:revisionId AS uuid) IS NULL OR r.id = CAST(:revisionId AS uuid))
          AND sr.finished_at >= CAST(:from AS date)::timestamp AT TIME ZONE 'UTC'
          AND sr.finished_at < (CAST(:to AS date) + 1)::timestamp AT TIME ZONE 'UTC'
        GROUP BY c.id)
     SELECT DISTINCT ON (c.key) c.key AS ref, ${CHECK_COLUMNS},
            sum(rd.n) OVER (PARTITION BY c.key) AS readings
       FROM readings rd
       JOIN checks c ON c.id = rd.check_id
       JOIN revisions r ON r.id = c.revision_id
       JOIN route_steps rs ON rs.id = c.step_id
      ORDER BY c.key, r.letter DESC`,
    { replacements: scope },
  )
  rows.sort((a, b) => a.step_position - b.step_position || a.key.localeCompare(b.key))
  if (!query.checkKey) return { checks: rows.map(toCheck), selected: null }
  const check = rows.find((r) => r.key === query.checkKey)
  if (!check) return { checks: rows.map(toCheck), selected: null }
  const points = await select<PointRow>(
    `SELECT u.serial, l.number AS lot_number, sr.attempt, sr.finished_at, m.value_number AS value
       FROM revisions r
       JOIN checks c ON c.revision_id = r.id AND c.key = :checkKey
       JOIN measurements m ON m.check_id = c.id AND m.value_number IS NOT NULL
       JOIN step_runs sr ON sr.id = m.step_run_id
       JOIN units u ON u.id = sr.unit_id
       JOIN lots l ON l.id = u.lot_id
      WHERE r.product_id = :productId
        AND (CAST(:revisionId AS uuid) IS NULL OR r.id = CAST(:revisionId AS uuid))
        AND sr.finished_at >= CAST(:from AS date)::timestamp AT TIME ZONE 'UTC'
        AND sr.finished_at < (CAST(:to AS date) + 1)::timestamp AT TIME ZONE 'UTC'
      ORDER BY sr.finished_at DESC, sr.id DESC
      LIMIT :limit`,
    { replacements: { ...scope, checkKey: check.key, limit: STATISTICS_MAX_POINTS + 1 } },
  )
  return { checks: rows.map(toCheck), selected: seriesOf(check, points, check.letter) }
}
