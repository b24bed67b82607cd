import { z } from 'zod'
import { text } from './common'

/**
 * A supplier's name as it is kept: trimmed, each run of white space made one space. Case is
 * kept as typed; two names with the same `supplierNameKey` are one supplier.
 */
export function tidySupplierName(name: string): string {
  return name.trim().replace(/\s+/g, ' ')
}

/**
 * The key under which spellings of one supplier meet: the tidy name in lower case. The
 * database's unique index on suppliers (migration 20261205130700) computes the same key.
 */
export function supplierNameKey(name: string): string {
  return tidySupplierName(name).toLowerCase()
}

/** A supplier's name as receiving types or picks it. */
export const supplierName = () =>
  text()
    .transform(tidySupplierName)
    .pipe(z.string().min(1, 'enter the supplier').max(120, 'at most 120 characters'))

export const SupplierInput = z.object({ name: supplierName() })
export type SupplierInput = z.infer<typeof SupplierInput>

/** The suggestions as receiving types a name: by substring, at most `limit`, by name. */
export const SupplierQuery = z.object({
  q: text().trim().max(120).default(''),
  limit: z.coerce.number().int().min(1).max(50).default(20),
})
export type SupplierQuery = z.infer<typeof SupplierQuery>

export interface SupplierDto {
  id: string
  name: string
  /** How many component lots came from this supplier. */
  lotCount: number
}
