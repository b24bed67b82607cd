import type { z } from 'zod'
import { AppError } from '../errors'

/**
 * Parses input with a shared zod schema, or throws a 400 whose `fields` name every bad field and
 * whose message reads `field: problem` for the first of them.
 */
export function parse<S extends z.ZodType>(schema: S, input: unknown): z.infer<S> {
  const result = schema.safeParse(input)
  if (result.success) return result.data
  const fields: Record<string, string> = {}
  for (const issue of result.error.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_'
    fields[key] ??= issue.message
  }
  const [first] = Object.entries(fields)
  throw AppError.badRequest(first ? `${first[0]}: ${first[1]}` : 'invalid input', fields)
}
