// What the server answers before a release, read by the release confirmation and the revision page.
import type { ReleaseBlocker } from './completeness'
import type { RecipeChange } from './revisionChanges'

/** A released revision of the same product, and the lots built or planned to it. */
export interface ReleasedSiblingDto {
  id: string
  letter: string
  /** Lots released or in progress: they go on with this revision whatever happens to it. */
  openLots: number
  /** Planned lots: a lead moves them to a released revision before releasing them. */
  plannedLots: number
}

/** What the release confirmation needs: what stops it, what changes, what it replaces. */
export interface ReleaseCheckDto {
  problems: string[]
  blockers: ReleaseBlocker[]
  /** Changes against the revision copied from; null for a revision made from nothing. */
  changes: RecipeChange[] | null
  copiedFrom: { id: string; letter: string } | null
  released: ReleasedSiblingDto[]
}
