import { z } from 'zod'
import { isScannedCode } from '../links'

/** A UTF-16 surrogate without its other half: JavaScript strings may hold one, UTF-8 cannot. */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/

/**
 * Why a text cannot be stored as sent, or null when it can: PostgreSQL refuses a NUL in text
 * and in JSON, and a lone surrogate has no UTF-8 form (it would be saved as U+FFFD, or refused
 * in a JSON column). File names and path parameters are checked with this too.
 */
export function textProblem(value: string): string | null {
  if (value.includes('\u0000')) return 'must not contain a NUL character'
  if (LONE_SURROGATE.test(value)) return 'must not contain a broken character (a lone surrogate)'
  return null
}

/**
 * Every string field of the shared schemas: a zod string that refuses what `textProblem`
 * names, so bad text is a 400 at validation, never an error from the database. Chain `.trim()`,
 * `.min()`, `.max()`, `.uuid()`… on it as on `z.string()`.
 */
export function text() {
  return z.string().check((ctx) => {
    const problem = textProblem(ctx.value)
    if (problem) ctx.issues.push({ code: 'custom', message: problem, input: ctx.value })
  })
}

/**
 * What a scan box sends: a bare code or one of our URLs (`…/u/<serial>`), which must name a
 * code (`not a serial`, `not a component lot code`) once read by `codeFromScan`.
 */
export function scanText(what: string, empty: string, max = 200) {
  return (
    text()
      .trim()
      .min(1, empty)
      .max(max, `at most ${max} characters`)
      // Empty text has its own message above.
      .refine((v) => v === '' || isScannedCode(v), `not a ${what}`)
  )
}

/** A calendar day as every form and filter sends it: YYYY-MM-DD. */
export const isoDate = text().regex(/^\d{4}-\d{2}-\d{2}$/, 'use a date like 2026-12-01')

/** A record id in a path: a UUID. A malformed id is a 400, not a database error. */
export const IdParam = text().uuid('not a valid id')

/** Paging of list endpoints: 1-based page, at most 200 rows. */
export const PageQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
})

type Undefaulted<T> = T extends z.ZodDefault<infer Inner> ? Inner : T

/**
 * The PATCH form of a create schema: every field optional and no defaults. Zod 4 applies a
 * field's default even inside `.partial()`, which would quietly reset every field a PATCH
 * leaves out; this strips the defaults first.
 */
export function patchSchema<T extends z.ZodRawShape>(schema: z.ZodObject<T>) {
  const shape = Object.fromEntries(
    Object.entries(schema.shape).map(([key, field]) => [
      key,
      ((field instanceof z.ZodDefault ? field.unwrap() : field) as z.ZodType).optional(),
    ]),
  )
  return z.object(shape) as unknown as z.ZodObject<{
    [K in keyof T]: z.ZodOptional<Undefaulted<T[K]>>
  }>
}
