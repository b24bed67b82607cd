import type { Transaction } from 'sequelize'
import { codeFromScan } from '../../shared/links'
import type { StepRunInput } from '../../shared/schemas/lots'
import type { LotToFit } from '../../shared/floor/componentLotRefusal'
import { AppError } from '../errors'
import { BomLine, ComponentLot, Consumption, Part } from '../models'

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
  }
}

type Scan = StepRunInput['consumptions'][number]

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
    if (
      itemSerial &&
      (await Consumption.findOne({ where: { componentLotId: lot.id, itemSerial }, transaction }))
    )
      throw AppError.conflict(
        'item_serial_used',
        `${line.part!.partNumber} serial ${itemSerial} is already fitted to another unit`,
        {
          [`consumptions.${line.id}`]: 'already fitted to another unit',
        },
      )
    await Consumption.create(
      {
        unitId,
        componentLotId: lot.id,
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
