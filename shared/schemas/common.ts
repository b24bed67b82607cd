import { z } from 'zod'

/** A record id in a path: a UUID. A malformed id is a 400, not a database error. */
export const IdParam = z.string().uuid('not a valid id')

/** Paging of list endpoints: 1-based page, at most 200 rows. */
export const PageQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
})
