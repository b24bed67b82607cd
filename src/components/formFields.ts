import { inject, provide } from 'vue'
import type { InjectionKey } from 'vue'

/**
 * What a form hands down to its `FormField`s: the model the plain text fields edit, and the
 * field messages to show (the server's refusal, and any cross-field problems of the form).
 */
export interface FormFieldContext {
  readonly model: Record<string, unknown>
  readonly errors: Readonly<Record<string, string | undefined>>
}

const FORM_FIELDS: InjectionKey<() => FormFieldContext> = Symbol('form fields')

/**
 * Makes `model` and `errors` reach every `FormField` below the calling component. FormDialog
 * calls it; a form outside a dialog (a drawer, a page) calls it itself.
 * @param context read on each render, so its parts may change
 */
export function provideFormFields(context: () => FormFieldContext) {
  provide(FORM_FIELDS, context)
}

/** The context of the nearest form above, or an empty one outside any form. */
export function injectFormFields(): () => FormFieldContext {
  return inject(FORM_FIELDS, () => ({ model: {}, errors: {} }))
}

/** One choice of a select field: the value it stores and the words shown for it. */
export interface FieldOption {
  readonly value: string
  readonly label: string
}

/**
 * The choices of a select over a fixed list, each shown by its label.
 * @param values the stored values, in the order offered
 * @param labels the words for each value
 */
export function labelledOptions<V extends string>(
  values: readonly V[],
  labels: Readonly<Record<V, string>>,
): FieldOption[] {
  return values.map((value) => ({ value, label: labels[value] }))
}
