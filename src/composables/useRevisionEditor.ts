import { ElMessage } from 'element-plus'
import type {
  BomLineDto,
  BomLineInput,
  CheckDto,
  CheckInput,
  RevisionUpdateInput,
  StepDto,
  StepInput,
  WindingDto,
  WindingInput,
} from '@shared/schemas/recipes'
import { ApiError, messageOf } from '@/api/client'
import { useRevisionStore } from '@/stores/revision'
import { confirmAction } from './confirmAction'
import { useEditDialog } from './useEditDialog'
import { useSubmit } from './useSubmit'

/** The check dialog edits a check of one step, or adds one to it. */
export interface CheckTarget {
  step: StepDto
  check: CheckDto | null
}

/**
 * The edits of the revision editor: a dialog per kind of record, confirmed deletes, the route
 * order and the settings form. A 409 `revision_frozen` (released elsewhere meanwhile) reloads
 * the revision, so the screen turns read-only with the server's message shown.
 */
export function useRevisionEditor() {
  const store = useRevisionStore()

  function onError(error: unknown) {
    if (!(error instanceof ApiError && error.code === 'revision_frozen')) return
    // Released meanwhile (another tab, another engineer): nothing open here can be saved now.
    for (const dialog of [winding, step, check, bomLine]) dialog.isOpen = false
    void store.reload().catch(() => undefined)
  }

  async function confirmThen(
    message: string,
    title: string,
    action: () => Promise<unknown>,
    success: string,
  ) {
    if (!(await confirmAction(message, title, 'Delete'))) return
    try {
      await action()
      ElMessage.success(success)
    } catch (error) {
      ElMessage.error(messageOf(error))
      onError(error)
    }
  }

  const winding = useEditDialog<WindingDto, WindingInput>(
    (w, input) => store.saveWinding(w?.id ?? null, input),
    (w) => (w ? 'Winding saved' : 'Winding added'),
    onError,
  )
  const step = useEditDialog<StepDto, StepInput>(
    (s, input) => store.saveStep(s?.id ?? null, input),
    (s) => (s ? 'Step saved' : 'Step added at the end of the route'),
    onError,
  )
  const check = useEditDialog<CheckTarget, CheckInput>(
    (t, input) => store.saveCheck(t!.step.id, t!.check?.id ?? null, input),
    (t) => (t?.check ? 'Check saved' : 'Check added'),
    onError,
  )
  const bomLine = useEditDialog<BomLineDto, BomLineInput>(
    (l, input) => store.saveBomLine(l?.id ?? null, input),
    (l) => (l ? 'Line saved' : 'Part added to the bill of materials'),
    onError,
  )
  const settings = useSubmit()

  return {
    winding,
    step,
    check,
    bomLine,
    settings,
    saveSettings: (input: RevisionUpdateInput) =>
      settings.run(() => store.update(input), 'Saved', onError),
    reorder: (ids: string[]) =>
      store.reorderSteps(ids).catch((error) => {
        ElMessage.error(messageOf(error))
        onError(error)
      }),
    removeWinding: (w: WindingDto) =>
      confirmThen(
        `Delete winding "${w.name}"? Derived checks that read it will need another winding.`,
        'Delete winding',
        () => store.removeWinding(w.id),
        'Winding deleted',
      ),
    removeStep: (s: StepDto) =>
      confirmThen(
        `Delete step ${s.position} "${s.name}" and its ${s.checks.length} checks? The steps after it move up.`,
        'Delete step',
        () => store.removeStep(s.id),
        'Step deleted',
      ),
    removeCheck: (c: CheckDto) =>
      confirmThen(
        `Delete check ${c.key} "${c.label}"?`,
        'Delete check',
        () => store.removeCheck(c.id),
        'Check deleted',
      ),
    removeBomLine: (l: BomLineDto) =>
      confirmThen(
        `Remove ${l.partNumber} from the bill of materials?`,
        'Remove part',
        () => store.removeBomLine(l.id),
        'Part removed',
      ),
  }
}
