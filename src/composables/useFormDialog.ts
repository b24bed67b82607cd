import { computed } from 'vue'
import type { FormRules } from 'element-plus'
import type { DialogState } from './useEditDialog'
import { useRecordForm } from './useRecordForm'

/** The part of a `useEditDialog` state a form dialog fills from and submits to. */
export interface FormDialogState<T, I> extends DialogState {
  readonly target: T | null
  submit(input: I): unknown
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
 */
export function useFormDialog<F extends object, I>(
  dialog: () => FormDialogState<{ readonly [K in keyof F]?: F[K] | null }, I>,
  empty: () => F,
  toInput: (form: F) => I,
  rules?: FormRules | (() => FormRules),
) {
  const { form, fill } = useRecordForm(empty)

  function submit() {
    dialog().submit(toInput({ ...form } as F))
  }

  const bind = computed(() => ({
    dialog: dialog(),
    model: form as Record<string, unknown>,
    rules: typeof rules === 'function' ? rules() : rules,
    onOpen: () => fill(dialog().target),
    onSubmit: submit,
  }))

  return { form, fill, submit, bind }
}
