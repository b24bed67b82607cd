import { createHash } from 'node:crypto'

/** Our own namespace for the step-run events of imported bench rows (a random v4, fixed). */
export const IMPORT_EVENT_NAMESPACE = '3f1c9a6e-5b0d-4c7e-9a2f-8d4e6b1a7c53'

/**
 * A name-based UUID, version 5 (RFC 9562 §5.5): SHA-1 of the namespace's 16 bytes and the
 * name's UTF-8 bytes, first 16 bytes kept, version and variant bits set.
 */
export function uuidV5(name: string, namespace: string): string {
  const ns = Buffer.from(namespace.replace(/-/g, ''), 'hex')
  if (ns.length !== 16) throw new RangeError(`namespace ${namespace} is not a UUID`)
  const bytes = createHash('sha1').update(ns).update(name, 'utf8').digest().subarray(0, 16)
  bytes[6] = (bytes[6]! & 0x0f) | 0x50
  bytes[8] = (bytes[8]! & 0x3f) | 0x80
  const hex = bytes.toString('hex')
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`
}

/**
 * The step-run event id of one row of one file: the same file (by content) and row always give
 * the same id, so importing a file again, or a retried job, records nothing new.
 */
export function importRowEventId(fileSha256: string, rowNumber: number): string {
  return uuidV5(`bench-row:${fileSha256}:${rowNumber}`, IMPORT_EVENT_NAMESPACE)
}
