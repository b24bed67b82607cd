import { fileTypeFromBuffer } from 'file-type'
import type { Transaction } from 'sequelize'
import type { UploadDto } from '../../shared/schemas/receiving'
import { AppError } from '../errors'
import { Upload } from '../models'
import { putFile } from '../storage'

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
  // Keep the name a person gave, minus any path, for the download.
  const filename = file.originalname.split(/[\\/]/).pop()!.slice(0, 200) || `file.${type.ext}`
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
