import type { Response } from 'express'
import { fileTypeFromBuffer } from 'file-type'
import { safeFileName } from '../services/receiving'

/** What a stored file's bytes may be served as when nothing better is known. */
const OPAQUE = 'application/octet-stream'

/**
 * The type to serve stored bytes as: the type recorded for them only if file-type, reading the
 * bytes again, finds the same; otherwise (unknown content, text, a mismatch) opaque bytes.
 */
export async function servedType(body: Buffer, recorded: string | null | undefined) {
  const want = (recorded ?? '').split(';')[0]!.trim().toLowerCase()
  const found = await fileTypeFromBuffer(body)
  return found && found.mime === want ? found.mime : OPAQUE
}

/**
 * Sends a stored file (an upload, a received attachment, a generated document) so that a
 * browser never runs it in the app's origin: always a download (`attachment`) under a safe
 * base name, its type checked again from the bytes, no type sniffing, and a CSP sandbox with
 * nothing allowed in case the file is opened anyway.
 */
export async function sendStoredFile(
  res: Response,
  file: { body: Buffer; contentType: string | null | undefined; filename: string },
): Promise<void> {
  // attachment() sets a type from the name's extension; the checked type replaces it below.
  res.attachment(safeFileName(file.filename, 'file'))
  res.setHeader('Content-Type', await servedType(file.body, file.contentType))
  res.setHeader('X-Content-Type-Options', 'nosniff')
  res.setHeader('Content-Security-Policy', "sandbox; default-src 'none'")
  res.setHeader('Cache-Control', 'private, no-store')
  res.send(file.body)
}
