import { randomBytes, randomUUID } from 'node:crypto'
import type { Page } from 'playwright-core'
import type { StationKind } from '../../../shared/stations'
import type { ComponentLotDto, PageDto } from '../../../shared/schemas/componentLots'
import type { LotDto, UnitSummaryDto } from '../../../shared/schemas/lots'
import type {
  BomLineDto,
  CheckDto,
  ProductDto,
  RevisionDto,
  StepDto,
} from '../../../shared/schemas/recipes'
import { callApi } from './setup'

// Finds demo entities by what they are, through the API with the page's session, never by a
// seeded id or serial: the demo scenario changes, the behaviour the journeys need does not.

/** Station codes of the demo shop, by kind; the Floor is opened at a station of the step's kind. */
export async function stationOf(page: Page, kind: StationKind): Promise<string> {
  const stations = await callApi<{ code: string; kind: StationKind; isActive: boolean }[]>(
    page,
    '/stations',
  )
  const station = stations.find((s) => s.kind === kind && s.isActive !== false)
  if (!station) throw new Error(`the demo has no active ${kind} station`)
  return station.code
}

/**
 * The route of the demo's converters: the journeys look for products built this way, so that
 * the small recipes other tests make are never taken for demo data.
 */
export const DEMO_ROUTE: readonly StationKind[] = ['winding', 'soldering', 'hipot', 'load_test']

/**
 * The released revisions whose route holds these station kinds in this order (other steps may
 * sit between them), newest product first.
 */
export async function revisionsWithRoute(
  page: Page,
  kinds: readonly StationKind[],
): Promise<RevisionDto[]> {
  const products = await callApi<ProductDto[]>(page, '/products')
  const found: RevisionDto[] = []
  for (const product of products)
    for (const summary of product.revisions.filter((r) => r.status === 'released')) {
      const revision = await callApi<RevisionDto>(page, `/revisions/${summary.id}`)
      const route = revision.steps.map((s) => s.stationKind)
      let at = 0
      for (const kind of route) if (kind === kinds[at]) at++
      if (at === kinds.length) found.push(revision)
    }
  return found
}

/** The step of a revision's route at a station kind; throws if the route has none. */
export function stepOf(revision: RevisionDto, kind: StationKind): StepDto {
  const step = revision.steps.find((s) => s.stationKind === kind)
  if (!step) throw new Error(`${revision.productCode} rev ${revision.letter} has no ${kind} step`)
  return step
}

/** Releases a new lot of `quantity` units of a revision (the page must be a lead's). */
export async function releaseNewLot(
  page: Page,
  revisionId: string,
  quantity: number,
  orderRef: string,
): Promise<{ lot: LotDto; units: UnitSummaryDto[] }> {
  const lot = await callApi<LotDto>(page, '/lots', 'POST', { revisionId, quantity, orderRef })
  const released = await callApi<LotDto>(page, `/lots/${lot.id}/release`, 'POST', {})
  return { lot: released, units: await callApi<UnitSummaryDto[]>(page, `/lots/${lot.id}/units`) }
}

/**
 * A unit waiting at the first step of `revision` in a lot that is not on hold: one of the demo's
 * lots in progress if one has a unit waiting there, else a new one-unit lot released for it.
 * The page must be a lead's, who may release lots.
 */
export async function unitWaitingAtStart(
  page: Page,
  revision: RevisionDto,
  orderRef: string,
): Promise<{ lotId: string; serial: string }> {
  const first = revision.steps[0]!
  const lots = await callApi<LotDto[]>(page, '/lots')
  for (const lot of lots) {
    if (lot.revisionId !== revision.id || lot.isOnHold) continue
    if (lot.status !== 'released' && lot.status !== 'in_progress') continue
    const units = await callApi<UnitSummaryDto[]>(page, `/lots/${lot.id}/units`)
    const unit = units.find((u) => u.state === 'queued' && u.currentStep?.id === first.id)
    if (unit) return { lotId: lot.id, serial: unit.serial }
  }
  const { lot, units } = await releaseNewLot(page, revision.id, 1, orderRef)
  return { lotId: lot.id, serial: units[0]!.serial }
}

/**
 * A component lot that may be fitted today for each BOM line: available, not expired, with
 * stock for a few units. Part number to its internal code.
 */
export async function usableLotCodes(
  page: Page,
  lines: readonly BomLineDto[],
): Promise<Map<string, string>> {
  const stock = await callApi<PageDto<ComponentLotDto>>(
    page,
    '/component-lots?status=available&pageSize=200',
  )
  const codes = new Map<string, string>()
  for (const line of lines) {
    const lot = stock.rows.find(
      (c) => c.partId === line.partId && !c.isExpired && c.quantityRemaining >= line.quantity * 4,
    )
    if (!lot) throw new Error(`the demo has no usable component lot of ${line.partNumber}`)
    codes.set(line.partNumber, lot.internalCode)
  }
  return codes
}

/** A part serial no earlier run has fitted, for a serial-traced BOM line. */
export function freshItemSerial(partNumber: string): string {
  return `${partNumber}-${randomBytes(4).toString('hex').toUpperCase()}`
}

/**
 * What an operator types for a check the recipe can pass: the nominal, else the middle of the
 * limits, else half the one limit given. Yes/no answers are "yes"; a choice is its first passing
 * option (its 1-based key on the Floor). Derived checks are computed, never typed.
 */
export function passingEntry(check: CheckDto): string | null {
  if (check.derived) return null
  if (check.kind === 'boolean') return 'y'
  if (check.kind === 'choice') {
    const at = (check.choices ?? []).findIndex((c) => c.isPass)
    return at < 0 ? null : String(at + 1)
  }
  if (check.kind === 'text') return 'as specified'
  const { nominal, lower, upper } = check
  const value =
    nominal ??
    (lower !== null && upper !== null
      ? (lower + upper) / 2
      : upper !== null
        ? upper / 2
        : (lower ?? 0) + 1)
  return value.toFixed(check.decimals)
}

/** BOM lines fitted at a step. */
export function linesAt(revision: RevisionDto, step: StepDto): BomLineDto[] {
  return revision.bom.filter((b) => b.fittedAtStepId === step.id)
}

/**
 * A step-run submission for `serial` at `station` with every input check at its passing entry
 * (numbers as numbers), `over` replacing some readings, and a lot per BOM line fitted there.
 */
export function stepRunBody(
  revision: RevisionDto,
  step: StepDto,
  serial: string,
  station: string,
  codes: ReadonlyMap<string, string>,
  over: Record<string, number> = {},
  defectCodeId: string | null = null,
) {
  const values: Record<string, number | boolean | string> = {}
  for (const check of step.checks) {
    const entry = passingEntry(check)
    if (entry === null) continue
    if (check.kind === 'boolean') values[check.key] = true
    else if (check.kind === 'choice') values[check.key] = check.choices![Number(entry) - 1]!.value
    else if (check.kind === 'numeric') values[check.key] = Number(entry)
    else values[check.key] = entry
  }
  return {
    clientEventId: randomUUID(),
    serial,
    stationCode: station,
    values: { ...values, ...over },
    consumptions: linesAt(revision, step).map((line) => ({
      bomLineId: line.id,
      code: codes.get(line.partNumber)!,
      ...(line.traceLevel === 'serial' ? { itemSerial: freshItemSerial(line.partNumber) } : {}),
    })),
    defectCodeId,
  }
}
