import type { FormItemRule, FormRules } from 'element-plus'
import type { z } from 'zod'
import { toSentence } from './format'

export interface ZodRulesOptions {
  /** When Element Plus re-checks a field; blur suits text, change suits selects and switches. */
  trigger?: 'blur' | 'change' | Array<'blur' | 'change'>
}

/**
 * Builds Element Plus rules from a zod object schema, one rule per field, so the message
 * under a field is the one the server would send for the same value.
 * An empty string in an optional field counts as "not given" (e.g. a blank new password).
 * @param schema the shared zod input schema, e.g. `StationCreateInput`
 */
export function useZodRules<S extends z.ZodObject>(
  schema: S,
  options: ZodRulesOptions = {},
): FormRules<z.input<S>> {
  const trigger = options.trigger ?? ['blur', 'change']
  const rules: Record<string, FormItemRule[]> = {}
  for (const [key, field] of Object.entries(schema.shape) as Array<[string, z.ZodType]>) {
    const isOptional = field.isOptional()
    rules[key] = [
      {
        // `required` only draws the asterisk; the validator below decides.
        required: !isOptional,
        trigger,
        validator: (_rule, value, callback) => {
          if (isOptional && (value === '' || value === null || value === undefined))
            return callback()
          const result = field.safeParse(value)
          if (result.success) return callback()
          callback(new Error(toSentence(result.error.issues[0]?.message ?? 'check this value')))
        },
      },
    ]
  }
  return rules as FormRules<z.input<S>>
}
