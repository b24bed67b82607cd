/**
 * A query string from a filter object; empty, null and undefined values are left out, so the
 * server applies its own defaults.
 */
export function toSearchParams(query: object): URLSearchParams {
  const params = new URLSearchParams()
  for (const [key, value] of Object.entries(query)) {
    if (value !== undefined && value !== null && value !== '') params.set(key, String(value))
  }
  return params
}
