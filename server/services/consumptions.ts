import { QueryTypes } from 'sequelize'
import type { Transaction } from 'sequelize'
import { codeFromScan } from '../../shared/links'
import type { StepRunInput } from '../../shared/schemas/lots'
import { AppError } from '../errors'
import { BomLine, ComponentLot, Consumption, db, Part } from '../models'
import { todayIso } from './componentLots'

/** Why a component lot cannot be fitted on a line, in the operator's words; null when it can. */
export function componentLotRefusal(
  lot: ComponentLot,
  line: BomLine,
  perUnit: number,
  today: string,
): string | null {
  const code = lot.internalCode
  if (lot.partId !== line.partId)
    return `${code} is ${lot.part?.partNumber ?? 'another part'}; this line needs ${line.part?.partNumber ?? 'another part'}`
  if (lot.status === 'quarantined') return `${code} is quarantined; take a lot that is available`
  if (lot.status === 'rejected') return `${code} was rejected; return it to stores`
  if (lot.status === 'used_up') return `${code} is used up; take a new lot from stores`
  if (lot.expiresOn !== null && lot.expiresOn < today)
    return `${code} expired on ${lot.expiresOn}; return it to stores`
  if (lot.quantityRemaining < perUnit)
    return `${code} has only ${lot.quantityRemaining} left; this unit needs ${perUnit}`
  return null
}

type Scan = StepRunInput['consumptions'][number]

/** The serial of the unit a part's item serial is fitted to, whichever lot it came from. */
async function unitHoldingSerial(
  partId: string,
  itemSerial: string,
  transaction: Transaction,
): Promise<string | null> {
  const [row] = await db().query<{ serial: string }>(
    `SELECT u.serial FROM consumptions c JOIN units u ON u.id = c.unit_id
      WHERE c.part_id = :partId AND c.item_serial = :itemSerial LIMIT 1`,
    { replacements: { partId, itemSerial }, type: QueryTypes.SELECT, transaction },
  )
  return row ? `unit ${row.serial}` : null
}

export interface PlannedConsumption {
  line: BomLine
  lot: ComponentLot
  itemSerial: string | null
}

/**
 * Matches the scanned component lots to the bill-of-materials lines fitted at this step, locks
 * each lot and checks it may be fitted. A missing scan is a 400 naming the line; a lot that
 * may not be used, or a part serial already fitted to a unit, is a 409 saying why.
 */
export async function planConsumptions(
  lines: readonly BomLine[],
  scans: Scan[],
  transaction: Transaction,
): Promise<PlannedConsumption[]> {
  const today = todayIso()
  const planned: PlannedConsumption[] = []
  for (const line of lines) {
    const field = `consumptions.${line.id}`
    const scan = scans.find((s) => s.bomLineId === line.id)
    if (!scan)
      throw AppError.badRequest(`${field}: scan a lot of ${line.part!.partNumber}`, {
        [field]: `scan a lot of ${line.part!.partNumber}`,
      })
    const lot = await ComponentLot.findOne({
      where: { internalCode: codeFromScan(scan.code) },
      transaction,
      lock: transaction.LOCK.UPDATE,
    })
    if (!lot)
      throw AppError.badRequest(`${field}: no component lot ${scan.code}`, {
        [field]: `no component lot ${scan.code}`,
      })
    lot.part = (await Part.findByPk(lot.partId, { transaction })) ?? undefined
    const refusal = componentLotRefusal(lot, line, line.quantity, today)
    if (refusal) throw AppError.conflict('component_lot_refused', refusal, { [field]: refusal })
    const itemSerial = scan.itemSerial?.trim().toUpperCase() || null
    if (line.traceLevel === 'serial' && !itemSerial)
      throw AppError.badRequest(
        `${field}: scan the serial of the ${line.part!.partNumber} fitted`,
        { [field]: 'scan the item’s serial' },
      )
    if (line.traceLevel === 'serial' && itemSerial) {
      const isTwice = planned.some(
        (p) => p.lot.partId === lot.partId && p.itemSerial === itemSerial,
      )
      const holder = isTwice
        ? 'another line of this run'
        : await unitHoldingSerial(lot.partId, itemSerial, transaction)
      if (holder)
        throw AppError.conflict(
          'item_serial_used',
          `${line.part!.partNumber} serial ${itemSerial} is already fitted to ${holder}`,
          { [field]: `already fitted to ${holder}` },
        )
    }
    planned.push({ line, lot, itemSerial: line.traceLevel === 'serial' ? itemSerial : null })
  }
  return planned
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
    // pass planConsumptions at once: the second waits for the first, then fails (stepRuns.ts).
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
