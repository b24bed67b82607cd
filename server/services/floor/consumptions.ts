import type { Transaction } from 'sequelize'
import { codeFromScan } from '../../../shared/links'
import type { StepRunInput } from '../../../shared/schemas/lots'
import type { LotToFit } from '../../../shared/floor/componentLotRefusal'
import type { FittedSerial } from '../../../shared/floor/decideStepRun'
import { BomLine, ComponentLot, Consumption, Part } from '../../models'
import { select } from '../../db/sql'

/** A component lot as the scan's decision reads it (shared/floor/componentLotRefusal.ts). */
export function toLotToFit(lot: ComponentLot): LotToFit {
  return {
    id: lot.id,
    internalCode: lot.internalCode,
    partId: lot.partId,
    partNumber: lot.part?.partNumber ?? '',
    status: lot.status,
    expiresOn: lot.expiresOn,
    quantityRemaining: lot.quantityRemaining,
    awaitsInspection: lot.awaitsInspection,
  }
}

type Scan = StepRunInput['consumptions'][number]

/**
 * The scanned part serials, of the locked lots' parts, that are already fitted to a unit
 * (whichever lot they came from), for decideStepRun's one-unit-per-serial rule.
 */
export async function serialsFittedAlready(
  lines: readonly BomLine[],
  lots: readonly ComponentLot[],
  scans: Scan[],
  transaction: Transaction,
): Promise<FittedSerial[]> {
  // Only serial-traced lines keep an item serial (decideStepRun drops the others'), so only
  // theirs are looked up: a lot-traced scan costs the scan's locked path no query.
  const serialLines = new Set(lines.filter((l) => l.traceLevel === 'serial').map((l) => l.id))
  const pairs = scans.flatMap((scan) => {
    if (!serialLines.has(scan.bomLineId)) return []
    const lot = lots.find((l) => l.internalCode === codeFromScan(scan.code))
    const itemSerial = scan.itemSerial?.trim().toUpperCase()
    return lot && itemSerial ? [{ partId: lot.partId, itemSerial }] : []
  })
  if (pairs.length === 0) return []
  return select<FittedSerial>(
    `SELECT c.part_id AS "partId", c.item_serial AS "itemSerial", u.serial AS "unitSerial"
       FROM consumptions c JOIN units u ON u.id = c.unit_id
      WHERE (c.part_id, c.item_serial) IN
            (SELECT * FROM unnest(ARRAY[:partIds]::uuid[], ARRAY[:serials]::text[]))`,
    {
      replacements: {
        partIds: pairs.map((p) => p.partId),
        serials: pairs.map((p) => p.itemSerial),
      },
      transaction,
    },
  )
}

export interface PlannedConsumption {
  line: BomLine
  lot: ComponentLot
  itemSerial: string | null
}

/**
 * Reads and locks, in line order, the component lots scanned for the bill-of-materials lines
 * fitted at this step, with their parts. Decides nothing: a line with no scan or a code that
 * names no lot is simply not among them, and decideStepRun (shared/floor/decideStepRun.ts) says
 * why; the locks keep the quantities it judged until the run is written.
 */
export async function lockComponentLots(
  lines: readonly BomLine[],
  scans: Scan[],
  transaction: Transaction,
): Promise<ComponentLot[]> {
  const lots: ComponentLot[] = []
  for (const line of lines) {
    const scan = scans.find((s) => s.bomLineId === line.id)
    if (!scan) continue
    const lot = await ComponentLot.findOne({
      where: { internalCode: codeFromScan(scan.code) },
      transaction,
      lock: transaction.LOCK.UPDATE,
    })
    if (!lot || lots.some((l) => l.id === lot.id)) continue
    lot.part = (await Part.findByPk(lot.partId, { transaction })) ?? undefined
    lots.push(lot)
  }
  return lots
}

/** Records the consumptions and takes the quantities out of stock; a lot at zero is used up. */
export async function applyConsumptions(
  planned: PlannedConsumption[],
  unitId: string,
  stepRunId: string,
  transaction: Transaction,
): Promise<void> {
  for (const { line, lot, itemSerial } of planned) {
    // The unique index on (part_id, item_serial) has the last word when two scans of one serial
    // pass the decision at once: the second waits for the first, then fails (stepRuns.ts).
    await Consumption.create(
      {
        unitId,
        componentLotId: lot.id,
        partId: lot.partId,
        bomLineId: line.id,
        stepRunId,
        quantity: line.quantity,
        itemSerial,
      },
      { transaction },
    )
    const remaining = Math.max(0, Math.round((lot.quantityRemaining - line.quantity) * 1e6) / 1e6)
    await lot.update(
      { quantityRemaining: remaining, status: remaining === 0 ? 'used_up' : lot.status },
      { transaction },
    )
  }
}
