import { createHash } from 'node:crypto'
import {
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3'
import { env } from './env'

let client: S3Client | undefined

function s3(): S3Client {
  client ??= new S3Client({
    endpoint: env.s3.endpoint,
    region: env.s3.region,
    forcePathStyle: true,
    credentials: { accessKeyId: env.s3.accessKeyId, secretAccessKey: env.s3.secretAccessKey },
  })
  return client
}

/** The hex sha256 of a buffer: files are stored under it, so the same content is kept once. */
export function sha256(body: Buffer): string {
  return createHash('sha256').update(body).digest('hex')
}

/**
 * Stores `body` under `<prefix>/<sha256>` and returns the key and digest. Content addressing makes
 * a retried upload or a document job that runs twice write the same object, never a second one.
 */
export async function putFile(prefix: string, body: Buffer, contentType: string) {
  const digest = sha256(body)
  const key = `${prefix}/${digest}`
  await s3().send(
    new PutObjectCommand({ Bucket: env.s3.bucket, Key: key, Body: body, ContentType: contentType }),
  )
  return { key, sha256: digest, size: body.length }
}

/** Reads a whole stored file; throws when the key is absent. */
export async function getFile(
  key: string,
): Promise<{ body: Buffer; contentType: string | undefined }> {
  const out = await s3().send(new GetObjectCommand({ Bucket: env.s3.bucket, Key: key }))
  const bytes = await out.Body!.transformToByteArray()
  return { body: Buffer.from(bytes), contentType: out.ContentType }
}

/** Whether a key exists in the bucket. */
export async function hasFile(key: string): Promise<boolean> {
  try {
    await s3().send(new HeadObjectCommand({ Bucket: env.s3.bucket, Key: key }))
    return true
  } catch (err) {
    if ((err as { name?: string }).name === 'NotFound') return false
    throw err
  }
}

/** Resolves when the bucket answers; used by the health check. */
export async function checkStorage(): Promise<void> {
  await s3().send(new HeadBucketCommand({ Bucket: env.s3.bucket }))
}
