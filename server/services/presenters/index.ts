/**
 * Helpers for presenters, the functions that turn a model or a SQL row into a DTO from `shared/`.
 * Most DTO fields are the row's own values under the same name (a model's) or under the
 * camelCase of its column (a plain SQL row's); these copy those, so a presenter spells out only
 * the fields it reshapes. A leaf below every area: it imports nothing.
 */

/** `lot_number` → `lotNumber`, as a type. */
export type CamelCase<S extends string> = S extends `${infer Head}_${infer Tail}`
  ? `${Head}${Capitalize<CamelCase<Tail>>}`
  : S

/** Copies `keys` of `source` as they are: for the DTO fields that keep a model's names. */
export function pickFields<T extends object, K extends keyof T>(
  source: T,
  keys: readonly K[],
): Pick<T, K> {
  const picked = {} as Pick<T, K>
  for (const key of keys) picked[key] = source[key]
  return picked
}

/** Copies `keys` of a plain SQL row under their camelCase names: `lot_number` → `lotNumber`. */
export function pickCamel<T extends object, K extends keyof T & string>(
  row: T,
  keys: readonly K[],
): { [P in K as CamelCase<P>]: T[P] } {
  const picked: Record<string, unknown> = {}
  for (const key of keys) picked[camelCase(key)] = row[key]
  return picked as { [P in K as CamelCase<P>]: T[P] }
}

function camelCase(name: string): string {
  return name.replace(/_([a-z0-9])/g, (_, letter: string) => letter.toUpperCase())
}

/**
 * A timestamp as ISO 8601 text. Plain SQL hands `timestamptz` back as a Date, a JSON-built one
 * as text; both read the same here.
 */
export function isoTime(value: Date | string): string {
  return new Date(value).toISOString()
}

/** `isoTime` of a timestamp that may be missing (a case not closed yet): null stays null. */
export function isoTimeOrNull(value: Date | string | null | undefined): string | null {
  return value == null ? null : isoTime(value)
}

/**
 * The part fields a line of stock or of a bill of materials shows, from its loaded `part`;
 * blank (and counted in pieces) while the part is not loaded.
 */
export function partFields<U extends string>(
  part: { partNumber: string; description: string; unitOfMeasure: U } | null | undefined,
): { partNumber: string; partDescription: string; unitOfMeasure: U | 'pcs' } {
  return {
    partNumber: part?.partNumber ?? '',
    partDescription: part?.description ?? '',
    unitOfMeasure: part?.unitOfMeasure ?? 'pcs',
  }
}
