import { reactive, ref, shallowRef } from 'vue'
import { useSubmit } from './useSubmit'

/**
 * State of one create/edit dialog: what it edits, whether it is open, and its save.
 * Returned reactive, so a template reads `winding.isOpen` without `.value`.
 * @param save stores the input; `target` is null when creating
 * @param success the message after saving, e.g. "Winding added"; it also gets the input, and
 *   is asked once the save is done, so it may read what the save changed
 * @param onError called after a refusal was shown, e.g. to reload a frozen revision
 */
export function useEditDialog<T, I>(
  save: (target: T | null, input: I) => Promise<unknown>,
  success: (target: T | null, input: I) => string,
  onError?: (error: unknown) => void,
) {
  const isOpen = ref(false)
  /** The record being edited, or null for a new one. */
  const target = shallowRef<T | null>(null)
  const { isSaving, fieldErrors, clearFieldErrors, run } = useSubmit()

  function open(next: T | null) {
    target.value = next
    clearFieldErrors()
    isOpen.value = true
  }

  async function submit(input: I) {
    const current = target.value
    if (
      await run(
        () => save(current, input),
        () => success(current, input),
        onError,
      )
    )
      isOpen.value = false
  }

  function close() {
    isOpen.value = false
  }

  return reactive({ isOpen, target, isSaving, fieldErrors, open, close, submit })
}

/**
 * What a form dialog component takes as its one `dialog` prop: the state of `useEditDialog`,
 * whose `target` it edits, whose `fieldErrors` it shows and whose `submit` it calls.
 */
export type EditDialog<T, I> = ReturnType<typeof useEditDialog<T, I>>

/** The part of a dialog's state that FormDialog reads: open, saving, the server's messages. */
export interface DialogState {
  readonly isOpen: boolean
  readonly isSaving: boolean
  readonly fieldErrors?: Readonly<Record<string, string>>
  close(): void
}
