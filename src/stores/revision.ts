import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import { releaseBlockers } from '@shared/recipes/completeness'
import { summarizeRecipeChanges } from '@shared/recipes/revisionChanges'
import type {
  BomLineInput,
  CheckDto,
  CheckInput,
  ReleaseInput,
  RevisionDto,
  RevisionUpdateInput,
  StepDto,
  StepInput,
  WindingInput,
} from '@shared/schemas/recipes'
import { bomApi, checksApi, revisionsApi, stepsApi, windingsApi } from '@/api/revisions'
import { useRecipesStore } from './recipes'
import { whileLoading } from './lists/whileLoading'

/** The revision open in the editor, and every change made to it. Each action throws ApiError. */
export const useRevisionStore = defineStore('revision', () => {
  /** The open revision, or null before the first fetch. */
  const revision = ref<RevisionDto | null>(null)
  /** True while the revision is being fetched. */
  const isLoading = ref(false)
  /** Released and obsolete revisions are frozen; the server refuses changes with 409. */
  const isFrozen = computed(() => revision.value !== null && revision.value.status !== 'draft')
  /** What would stop the release, computed here with the server's own rules as the engineer edits. */
  const liveProblems = computed(() => (revision.value ? releaseBlockers(revision.value) : []))
  /** The revision the open one was copied from, to compare with; null when there is none. */
  const base = ref<RevisionDto | null>(null)
  /** What the open revision changes against `base`, recomputed as the engineer edits. */
  const changes = computed(() =>
    revision.value && base.value ? summarizeRecipeChanges(base.value, revision.value) : null,
  )

  const catalogue = useRecipesStore()
  const id = () => revision.value!.id

  function take(next: RevisionDto) {
    revision.value = next
    catalogue.noteRevision(next)
    return next
  }

  /** Fetches a revision; keeps the old one on screen while a refetch of the same id runs. */
  async function load(revisionId: string) {
    if (revision.value?.id !== revisionId) revision.value = null
    await whileLoading(isLoading, async () => {
      const next = take(await revisionsApi.get(revisionId))
      const from = next.copiedFrom?.id ?? null
      // The source may be a draft deleted since, or hidden from this role: then no comparison.
      if (base.value?.id !== from)
        base.value = from ? await revisionsApi.get(from).catch(() => null) : null
    })
  }

  /** Fetches the open revision again, e.g. after the server said it is frozen. */
  const reload = () => load(id())

  const update = async (input: RevisionUpdateInput) => take(await revisionsApi.update(id(), input))
  const fetchReleaseCheck = () => revisionsApi.releaseCheck(id())
  const release = async (input: ReleaseInput) => take(await revisionsApi.release(id(), input))
  const obsolete = async () => take(await revisionsApi.obsolete(id()))
  /** A new draft copied from the open revision; the caller navigates to it. */
  const copy = async () => take(await revisionsApi.copy(id()))

  /** Deletes the open draft. */
  async function remove() {
    const { productId } = revision.value!
    await revisionsApi.remove(id())
    catalogue.forgetRevision(productId, id())
    revision.value = null
  }

  // --- windings -----------------------------------------------------------------------------
  async function saveWinding(windingId: string | null, input: WindingInput) {
    const saved = windingId
      ? await windingsApi.update(windingId, input)
      : await windingsApi.create(id(), input)
    const rev = revision.value!
    rev.windings = [...rev.windings.filter((w) => w.id !== saved.id), saved].sort(
      (a, b) => a.position - b.position,
    )
  }

  async function removeWinding(windingId: string) {
    await windingsApi.remove(windingId)
    revision.value!.windings = revision.value!.windings.filter((w) => w.id !== windingId)
  }

  // --- route --------------------------------------------------------------------------------
  function putStep(step: StepDto) {
    const rev = revision.value!
    rev.steps = [...rev.steps.filter((s) => s.id !== step.id), step].sort(
      (a, b) => a.position - b.position,
    )
  }

  async function saveStep(stepId: string | null, input: StepInput) {
    putStep(stepId ? await stepsApi.update(stepId, input) : await stepsApi.create(id(), input))
  }

  /** Deletes a step; the server renumbers the rest and clears BOM lines fitted there, so refetch. */
  async function removeStep(stepId: string) {
    await stepsApi.remove(stepId)
    await reload()
  }

  /** Puts the route in the given order, showing it at once and undoing it if the server refuses. */
  async function reorderSteps(stepIds: string[]) {
    const rev = revision.value!
    const before = rev.steps
    const byId = new Map(before.map((s) => [s.id, s]))
    rev.steps = stepIds.map((sid, i) => ({ ...byId.get(sid)!, position: i + 1 }))
    try {
      rev.steps = await stepsApi.reorder(rev.id, stepIds)
    } catch (error) {
      rev.steps = before
      throw error
    }
  }

  // --- checks -------------------------------------------------------------------------------
  function putCheck(check: CheckDto) {
    const step = revision.value!.steps.find((s) => s.id === check.stepId)
    if (!step) return
    step.checks = [...step.checks.filter((c) => c.id !== check.id), check].sort(
      (a, b) => a.position - b.position,
    )
  }

  async function saveCheck(stepId: string, checkId: string | null, input: CheckInput) {
    putCheck(
      checkId ? await checksApi.update(checkId, input) : await checksApi.create(stepId, input),
    )
  }

  async function removeCheck(checkId: string) {
    await checksApi.remove(checkId)
    for (const step of revision.value!.steps)
      step.checks = step.checks.filter((c) => c.id !== checkId)
  }

  // --- bill of materials --------------------------------------------------------------------
  async function saveBomLine(lineId: string | null, input: BomLineInput) {
    const saved = lineId ? await bomApi.update(lineId, input) : await bomApi.create(id(), input)
    const rev = revision.value!
    const at = rev.bom.findIndex((l) => l.id === saved.id)
    rev.bom = at < 0 ? [...rev.bom, saved] : rev.bom.map((l) => (l.id === saved.id ? saved : l))
  }

  async function removeBomLine(lineId: string) {
    await bomApi.remove(lineId)
    revision.value!.bom = revision.value!.bom.filter((l) => l.id !== lineId)
  }

  return {
    revision,
    isLoading,
    isFrozen,
    liveProblems,
    base,
    changes,
    load,
    reload,
    update,
    fetchReleaseCheck,
    release,
    obsolete,
    copy,
    remove,
    saveWinding,
    removeWinding,
    saveStep,
    removeStep,
    reorderSteps,
    saveCheck,
    removeCheck,
    saveBomLine,
    removeBomLine,
  }
})
