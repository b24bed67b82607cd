import type { ComponentLotStatus } from '../recipeDefinitions'

/** A component lot as the Floor reads it to fit it on a line. */
export interface LotToFit {
  id: string
  internalCode: string
  partId: string
  /** The lot's part number, for the operator's words. */
  partNumber: string
  status: ComponentLotStatus
  /** ISO date (YYYY-MM-DD), or null when the lot does not expire. */
  expiresOn: string | null
  quantityRemaining: number
  /** Quarantined on receipt until stores accept it at incoming inspection. */
  awaitsInspection?: boolean
}

/** A bill-of-materials line as the Floor fits a lot on it. */
export interface LineToFit {
  partId: string
  partNumber: string
}

/**
 * Why a component lot cannot be fitted on a line, in the operator's words; null when it can.
 * @param perUnit how much of the lot one unit takes
 * @param today the ISO date of the fitting (a lot may be used on the day it expires)
 */
export function componentLotRefusal(
  lot: LotToFit,
  line: LineToFit,
  perUnit: number,
  today: string,
): string | null {
  const code = lot.internalCode
  if (lot.partId !== line.partId)
    return `${code} is ${lot.partNumber || 'another part'}; this line needs ${line.partNumber || 'another part'}`
  if (lot.status === 'quarantined' && lot.awaitsInspection)
    return `${code} is awaiting incoming inspection; take a lot that stores have accepted`
  if (lot.status === 'quarantined') return `${code} is quarantined; take a lot that is available`
  if (lot.status === 'rejected') return `${code} was rejected; return it to stores`
  if (lot.status === 'used_up') return `${code} is used up; take a new lot from stores`
  if (lot.expiresOn !== null && lot.expiresOn < today)
    return `${code} expired on ${lot.expiresOn}; return it to stores`
  if (lot.quantityRemaining < perUnit)
    return `${code} has only ${lot.quantityRemaining} left; this unit needs ${perUnit}`
  return null
}
