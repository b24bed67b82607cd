import { computed } from 'vue'
import type { FormRules } from 'element-plus'
import type { DialogState } from './useEditDialog'
import { useRecordForm } from './useRecordForm'

/** The part of a `useEditDialog` state a form dialog fills from and submits to. */
export interface FormDialogState<T, I> extends DialogState {
  readonly target: T | null
  submit(input: I): unknown
}

/** A record a form of shape `F` can be filled from: any of its keys, each maybe missing. */
export type FormSource<F> = { readonly [K in keyof F]?: F[K] | null }

/** What a dialog does beyond filling its form from the target and submitting at once. */
export interface FormDialogOptions<F, I, T> {
  /** The record the form is filled from on opening, where it is not the target itself. */
  from?: (target: T | null) => FormSource<F> | null
  /** Asked with the input before it is submitted, e.g. to confirm a step that cannot be undone. */
  confirm?: (input: I) => Promise<boolean> | boolean
}

/**
 * What every create/edit dialog wires around FormDialog: its form (useRecordForm), filled from
 * the dialog's target each time it opens, and a submit that hands the dialog `toInput(form)`.
 * `bind` goes on FormDialog with `v-bind`: the dialog state, the model, the rules and both events.
 * @param dialog the component's `dialog` prop, read when used
 * @param empty the values of a new record
 * @param toInput the input the dialog saves, usually the shared zod schema's `parse`
 * @param rules the form's rules, usually from `useZodRules`; a function where they depend on the
 *   target (a create and an update schema)
 * @param options `from`, where the form is not filled from the target as it is, and `confirm`
 */
export function useFormDialog<F extends object, I>(
  dialog: () => FormDialogState<FormSource<F>, I>,
  empty: () => F,
  toInput: (form: F) => I,
  rules?: FormRules | (() => FormRules),
  options?: Omit<FormDialogOptions<F, I, FormSource<F>>, 'from'>,
): ReturnType<typeof wire<F, I, FormSource<F>>>
export function useFormDialog<F extends object, I, T>(
  dialog: () => FormDialogState<T, I>,
  empty: () => F,
  toInput: (form: F) => I,
  rules: FormRules | (() => FormRules) | undefined,
  options: FormDialogOptions<F, I, T> & Required<Pick<FormDialogOptions<F, I, T>, 'from'>>,
): ReturnType<typeof wire<F, I, T>>
export function useFormDialog<F extends object, I, T>(
  dialog: () => FormDialogState<T, I>,
  empty: () => F,
  toInput: (form: F) => I,
  rules?: FormRules | (() => FormRules),
  options: FormDialogOptions<F, I, T> = {},
) {
  return wire(dialog, empty, toInput, rules, options)
}

function wire<F extends object, I, T>(
  dialog: () => FormDialogState<T, I>,
  empty: () => F,
  toInput: (form: F) => I,
  rules: FormRules | (() => FormRules) | undefined,
  { from = (target) => target as FormSource<F> | null, confirm }: FormDialogOptions<F, I, T>,
) {
  const { form, fill } = useRecordForm(empty)

  async function submit() {
    const input = toInput({ ...form } as F)
    if (confirm && !(await confirm(input))) return
    dialog().submit(input)
  }

  const bind = computed(() => ({
    dialog: dialog(),
    model: form as Record<string, unknown>,
    rules: typeof rules === 'function' ? rules() : rules,
    onOpen: () => fill(from(dialog().target)),
    onSubmit: submit,
  }))

  return { form, fill, submit, bind }
}
