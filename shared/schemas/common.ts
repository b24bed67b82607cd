import { z } from 'zod'

/** A record id in a path: a UUID. A malformed id is a 400, not a database error. */
export const IdParam = z.string().uuid('not a valid id')

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
