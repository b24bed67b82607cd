import { fileTypeFromBuffer } from 'file-type'
import type { Transaction } from 'sequelize'
import type { UploadDto } from '../../../shared/schemas/componentLots'
import { AppError } from '../../errors'
import { Upload } from '../../models'
import { putFile } from '../../storage'

/** Types a supplier certificate may have, judged by content, never by the file name. */
export const CERTIFICATE_TYPES = ['application/pdf', 'image/png', 'image/jpeg'] as const
export const CERTIFICATE_MAX_BYTES = 10 * 1024 * 1024

export function toUploadDto(u: Upload): UploadDto {
  return {
    id: u.id,
    filename: u.filename,
    contentType: u.contentType,
    size: u.size,
    sha256: u.sha256,
  }
}

/** Longest file name kept, in characters; names are shown in lists and sent in headers. */
export const FILE_NAME_MAX = 120

/** C0, DEL and C1 controls; bidi embeddings, overrides and isolates (a name shown reversed). */
function isUnsafeChar(c: string): boolean {
  const n = c.codePointAt(0)!
  return (
    n < 0x20 ||
    (n >= 0x7f && n <= 0x9f) ||
    (n >= 0x202a && n <= 0x202e) ||
    (n >= 0x2066 && n <= 0x2069)
  )
}

/**
 * Reduces a file name a person or a mail sender gave to a safe base name: no folders (either
 * slash), no control or bidirectional-override characters, no leading dots or spaces, at most
 * FILE_NAME_MAX characters with the extension kept. `fallback` when nothing is left.
 */
export function safeFileName(name: string, fallback: string): string {
  const base = Array.from(name.normalize('NFC').split(/[\\/]/).pop() ?? '')
    .filter((c) => !isUnsafeChar(c))
    .join('')
    .trim()
    .replace(/^[.\s]+/, '')
  if (!base) return fallback
  // Counted in code points, so a cut never splits a character in two.
  const chars = Array.from(base)
  if (chars.length <= FILE_NAME_MAX) return base
  const dot = chars.lastIndexOf('.')
  const ext = dot > 0 && chars.length - dot <= 16 ? chars.slice(dot) : []
  return `${chars
    .slice(0, FILE_NAME_MAX - ext.length)
    .join('')
    .trimEnd()}${ext.join('')}`
}

/**
 * Checks a file's real type from its first bytes, stores it in the object store under its
 * sha256 and records it. A renamed executable or a text file called .pdf is a 415.
 */
export async function storeUpload(
  file: { buffer: Buffer; originalname: string },
  allowed: readonly string[],
  folder: string,
  uploadedBy: string | null,
  transaction: Transaction,
): Promise<Upload> {
  const type = await fileTypeFromBuffer(file.buffer)
  if (!type || !allowed.includes(type.mime))
    throw AppError.unsupportedType(
      `file: the content is ${type?.mime ?? 'not a known type'}; send ${allowed.join(', ')}`,
    )
  const stored = await putFile(folder, file.buffer, type.mime)
  // Keep the name a person gave, reduced to a safe base name, for the download.
  const filename = safeFileName(file.originalname, `file.${type.ext}`)
  return Upload.create(
    {
      storageKey: stored.key,
      sha256: stored.sha256,
      filename,
      contentType: type.mime,
      size: stored.size,
      uploadedBy,
    },
    { transaction },
  )
}
