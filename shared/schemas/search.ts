import { z } from 'zod'
import { PERMISSIONS } from '../permissions'
import type { Role } from '../roles'
import { text } from './common'

/** Shortest and longest text the search box sends. */
export const SEARCH_TEXT_MIN = 2
export const SEARCH_TEXT_MAX = 80
/** At most this many records of one kind are listed. */
export const SEARCH_HITS_PER_KIND = 5

/** `GET /api/search?q=`: the text of the top bar's search box. */
export const SearchQuery = z.object({
  q: text()
    .trim()
    .min(SEARCH_TEXT_MIN, `type at least ${SEARCH_TEXT_MIN} characters`)
    .max(SEARCH_TEXT_MAX, `at most ${SEARCH_TEXT_MAX} characters`),
})
export type SearchQuery = z.infer<typeof SearchQuery>

/** The kinds of record the search finds, in the order their groups are listed. */
export const SEARCH_KINDS = [
  'unit',
  'lot',
  'componentLot',
  'customer',
  'revision',
  'shipment',
  'serviceCase',
] as const
export type SearchKind = (typeof SEARCH_KINDS)[number]

/** Group headings of the results. */
export const SEARCH_KIND_LABELS: Record<SearchKind, string> = {
  unit: 'Units',
  lot: 'Lots',
  componentLot: 'Component lots',
  customer: 'Customers',
  revision: 'Products and revisions',
  shipment: 'Shipments',
  serviceCase: 'Returns',
}

/**
 * Who may find each kind: the roles that may read such records anywhere else. Everybody reads
 * released revisions; drafts only `PERMISSIONS.readDraftRecipes` (the service applies that).
 */
export const SEARCH_KIND_ROLES: Record<SearchKind, readonly Role[] | 'signed_in'> = {
  unit: PERMISSIONS.traceUnits,
  lot: PERMISSIONS.readLots,
  componentLot: PERMISSIONS.readComponentLots,
  customer: PERMISSIONS.readCustomers,
  revision: 'signed_in',
  shipment: PERMISSIONS.readShipments,
  serviceCase: PERMISSIONS.readServiceCases,
}

/** The kinds a role may find, in listing order. */
export function searchKindsFor(role: Role): SearchKind[] {
  return SEARCH_KINDS.filter((kind) => {
    const who = SEARCH_KIND_ROLES[kind]
    return who === 'signed_in' || who.includes(role)
  })
}

/** One record found. */
export interface SearchHitDto {
  kind: SearchKind
  id: string
  /** What the record is called: a serial, a lot number, a customer's name, `FP24 rev B`. */
  title: string
  /** A line that tells two similar records apart (its lot, product, status, customer…). */
  detail: string
  /**
   * The code that opens it: a serial for a unit, the internal code for a component lot; the
   * record's id for the others.
   */
  ref: string
  /** Why a record was found that was not typed as such (a corrected check character), or null. */
  note: string | null
}

/** The records of one kind that matched. */
export interface SearchGroupDto {
  kind: SearchKind
  label: string
  hits: SearchHitDto[]
}

/** The answer of `GET /api/search`: groups with at least one hit, in `SEARCH_KINDS` order. */
export interface SearchResultsDto {
  q: string
  groups: SearchGroupDto[]
}
