import { UNIT_STATE_LABELS } from '../../../shared/lots'
import type { UnitState } from '../../../shared/lots'
import { can } from '../../../shared/permissions'
import type { Role } from '../../../shared/roles'
import {
  SEARCH_HITS_PER_KIND,
  SEARCH_KIND_LABELS,
  SEARCH_KINDS,
  searchKindsFor,
} from '../../../shared/schemas/search'
import type {
  SearchGroupDto,
  SearchHitDto,
  SearchKind,
  SearchResultsDto,
} from '../../../shared/schemas/search'
import { containsPattern, searchTerms } from '../../../shared/searchTerms'
import type { SearchTerms } from '../../../shared/searchTerms'
import { select } from '../../db/sql'
import { SEARCH_SELECTS, searchStatement } from './searchSql'

interface HitRow {
  kind: SearchKind
  id: string
  title: string
  ref: string
  rank: number
  info: Record<string, string | number | boolean | null>
}

/** A serial fragment shorter than this matches most units; it is not looked for inside serials. */
const UNIT_FRAGMENT_MIN = 3

const words = (text: unknown) => String(text ?? '').replace(/_/g, ' ')
const joined = (...parts: unknown[]) =>
  parts
    .map((p) => (p === null || p === undefined ? '' : String(p).trim()))
    .filter(Boolean)
    .join(' · ')

/** The line under a hit's title, from what its SELECT put in `info`. */
function detailOf(row: HitRow): string {
  const i = row.info
  switch (row.kind) {
    case 'unit':
      return joined(
        `${i.product} rev ${i.letter}`,
        `lot ${i.lot}`,
        UNIT_STATE_LABELS[i.state as UnitState],
      )
    case 'lot':
      return joined(
        `${i.product} rev ${i.letter}`,
        `${i.quantity} units`,
        words(i.status),
        i.customer,
        i.orderRef,
      )
    case 'componentLot':
      return joined(i.part, i.supplier, `supplier lot ${i.supplierLot}`, words(i.status))
    case 'customer':
      return joined(i.email)
    case 'revision':
      return joined(i.name, words(i.status))
    case 'shipment':
      return joined(i.customer, `shipped ${i.shippedOn}`, i.orderRef, i.tracking)
    case 'serviceCase':
      return joined(`unit ${i.serial}`, i.customer, `received ${i.receivedOn}`, words(i.status))
  }
}

/**
 * Everything the top bar's search box finds for `typed`, grouped by kind, of the kinds `role`
 * may read (`SEARCH_KIND_ROLES`); draft revisions only for those who read drafts. A serial typed
 * without its check character, or with a wrong one, still finds its unit (`searchTerms`).
 * One statement, each part served by an index.
 */
export async function searchRecords(typed: string, role: Role): Promise<SearchResultsDto> {
  const terms = searchTerms(typed)
  const kinds = searchKindsFor(role)
  const selects: string[] = []
  for (const kind of kinds)
    for (const sql of SEARCH_SELECTS[kind]) {
      const isExactUnits = kind === 'unit' && sql === SEARCH_SELECTS.unit[0]
      if (isExactUnits && terms.serials.length === 0) continue
      if (kind === 'unit' && !isExactUnits && terms.text.length < UNIT_FRAGMENT_MIN) continue
      selects.push(sql)
    }
  if (selects.length === 0) return { q: terms.text, groups: [] }
  const rows = await select<HitRow>(searchStatement(selects), {
    replacements: {
      pattern: containsPattern(terms.text),
      upper: terms.text.toUpperCase(),
      // `IN ()` is not SQL: an empty list becomes one serial no unit has.
      serials: terms.serials.length ? terms.serials : [''],
      revCode: terms.revision?.productCode ?? null,
      revLetter: terms.revision?.letter ?? null,
      drafts: can(role, 'readDraftRecipes'),
    },
  })
  return { q: terms.text, groups: groupHits(rows, terms) }
}

function groupHits(rows: HitRow[], terms: SearchTerms): SearchGroupDto[] {
  const groups: SearchGroupDto[] = []
  for (const kind of SEARCH_KINDS) {
    const seen = new Set<string>()
    const hits: SearchHitDto[] = []
    const ofKind = rows.filter((r) => r.kind === kind).sort((a, b) => a.rank - b.rank)
    for (const row of ofKind) {
      if (seen.has(row.id)) continue
      seen.add(row.id)
      hits.push({
        kind,
        id: row.id,
        title: row.title,
        detail: detailOf(row),
        ref: row.ref,
        note: noteOf(row, terms),
      })
    }
    if (hits.length)
      groups.push({
        kind,
        label: SEARCH_KIND_LABELS[kind],
        hits: hits.slice(0, SEARCH_HITS_PER_KIND),
      })
  }
  return groups
}

/** Says why a unit was found when its serial is not what was typed. */
function noteOf(row: HitRow, terms: SearchTerms): string | null {
  if (row.kind !== 'unit' || row.info.exact !== true || row.title === terms.code) return null
  if (row.title === terms.serials[0] && terms.serialFix !== 'none')
    return `check character ${terms.serialFix}`
  return 'one character away from what was typed'
}
