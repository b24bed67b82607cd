import { createHash } from 'node:crypto'
import { mkdir, readFile, writeFile } from 'node:fs/promises'
import { dirname, join } from 'node:path'
import {
  CreateBucketCommand,
  DeleteObjectsCommand,
  GetObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3'
import { env } from '../../server/env'

// The object store half of a backup: every object of a bucket, through the same client settings
// as server/storage.ts, each saved as objects/<n> beside the manifest that names its key.

/** One stored object as the manifest lists it. */
export interface ManifestObject {
  key: string
  /** Its file inside the archive, relative to the archive's root. */
  file: string
  size: number
  sha256: string
  contentType: string | null
}

/** The archive's manifest.json. */
export interface Manifest {
  format: 'waymark-backup/1'
  createdAt: string
  database: string
  bucket: string
  databaseDump: string
  objectCount: number
  objects: ManifestObject[]
}

/** An S3 client set up as the app's (server/storage.ts); destroy it when done. */
export function storeClient(): S3Client {
  // The pinned SDK works on Node 20; its notice about later releases is noise here.
  process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true'
  return new S3Client({
    endpoint: env.s3.endpoint,
    region: env.s3.region,
    forcePathStyle: true,
    credentials: { accessKeyId: env.s3.accessKeyId, secretAccessKey: env.s3.secretAccessKey },
  })
}

const sha256 = (body: Buffer) => createHash('sha256').update(body).digest('hex')

/** Every key in `bucket`, page by page. */
export async function listKeys(s3: S3Client, bucket: string): Promise<string[]> {
  const keys: string[] = []
  let token: string | undefined
  do {
    const page = await s3.send(
      new ListObjectsV2Command({ Bucket: bucket, ContinuationToken: token }),
    )
    for (const o of page.Contents ?? []) if (o.Key) keys.push(o.Key)
    token = page.IsTruncated ? page.NextContinuationToken : undefined
  } while (token)
  return keys
}

/** Copies every object of `bucket` into `dir`/objects and answers their manifest entries. */
export async function saveObjects(
  s3: S3Client,
  bucket: string,
  dir: string,
): Promise<ManifestObject[]> {
  const saved: ManifestObject[] = []
  for (const [i, key] of (await listKeys(s3, bucket)).entries()) {
    const out = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: key }))
    const body = Buffer.from(await out.Body!.transformToByteArray())
    const file = `objects/${i}`
    await mkdir(dirname(join(dir, file)), { recursive: true })
    await writeFile(join(dir, file), body)
    saved.push({
      key,
      file,
      size: body.length,
      sha256: sha256(body),
      contentType: out.ContentType ?? null,
    })
  }
  return saved
}

/** Creates `bucket` if it does not exist; answers how many objects it holds. */
export async function prepareBucket(s3: S3Client, bucket: string): Promise<number> {
  try {
    await s3.send(new CreateBucketCommand({ Bucket: bucket }))
  } catch (err) {
    const name = (err as { name?: string }).name
    if (name !== 'BucketAlreadyOwnedByYou' && name !== 'BucketAlreadyExists') throw err
  }
  return (await listKeys(s3, bucket)).length
}

/** Empties `bucket` (restore --force), 1000 keys a request as S3 allows. */
export async function emptyBucket(s3: S3Client, bucket: string): Promise<void> {
  const keys = await listKeys(s3, bucket)
  for (let i = 0; i < keys.length; i += 1000)
    await s3.send(
      new DeleteObjectsCommand({
        Bucket: bucket,
        Delete: { Objects: keys.slice(i, i + 1000).map((Key) => ({ Key })) },
      }),
    )
}

/** Puts the archive's objects back into `bucket`, checking each against its sha256 first. */
export async function loadObjects(
  s3: S3Client,
  bucket: string,
  dir: string,
  objects: readonly ManifestObject[],
): Promise<void> {
  for (const o of objects) {
    const body = await readFile(join(dir, o.file))
    if (sha256(body) !== o.sha256)
      throw new Error(`archive damaged: ${o.file} (${o.key}) does not match its sha256`)
    await s3.send(
      new PutObjectCommand({
        Bucket: bucket,
        Key: o.key,
        Body: body,
        ContentType: o.contentType ?? undefined,
      }),
    )
  }
}
