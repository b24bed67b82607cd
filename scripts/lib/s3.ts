import { CreateBucketCommand, S3Client } from '@aws-sdk/client-s3'
import { fakeSpec, fakeState, startFake, stopFake } from './fakeProcess'
import type { FakeSpec } from './fakeProcess'
import type { ServiceState } from './postgres'
import type { ServiceConfig } from './serviceConfig'

type Log = (line: string) => void

async function createBuckets(config: ServiceConfig): Promise<void> {
  // The pinned SDK works on Node 20; its notice about later releases is noise here.
  process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true'
  const client = new S3Client({
    endpoint: config.s3Endpoint,
    forcePathStyle: true,
    region: 'us-east-1',
    credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
  })
  try {
    for (const bucket of config.buckets) {
      try {
        await client.send(new CreateBucketCommand({ Bucket: bucket }))
      } catch (err) {
        const name = (err as { name?: string }).name
        if (name !== 'BucketAlreadyOwnedByYou' && name !== 'BucketAlreadyExists') throw err
      }
    }
  } finally {
    client.destroy()
  }
}

function spec(config: ServiceConfig): FakeSpec {
  return fakeSpec(config, 's3', {
    portVariable: 'WAYMARK_S3_PORT',
    env: { ...process.env, WAYMARK_S3_PORT: String(config.s3Port), WAYMARK_S3_DIR: config.s3Dir },
    // s3rver signs ListObjectsV2 continuation tokens with DES, which OpenSSL 3 keeps in its
    // legacy provider: without it, a listing of more than 1000 keys answers 500 InternalError.
    nodeFlags: ['--openssl-legacy-provider'],
  })
}

/** Runs the S3 fake in the background and makes sure the buckets exist. */
export async function startS3(config: ServiceConfig, log: Log): Promise<void> {
  if (config.isS3External) {
    log(`s3: using S3_ENDPOINT=${config.s3Endpoint} (no local fake)`)
    return
  }
  const isNew = await startFake(spec(config), log)
  await createBuckets(config)
  if (isNew)
    log(`s3: started on ${config.host}:${config.s3Port}; buckets ${config.buckets.join(', ')}`)
}

/** Stops the fake named in our pid file. */
export async function stopS3(config: ServiceConfig, log: Log): Promise<void> {
  if (!config.isS3External) await stopFake(spec(config), log)
}

export function s3State(config: ServiceConfig): ServiceState {
  if (config.isS3External)
    return {
      name: 's3',
      isRunning: true,
      port: config.s3Port,
      pid: null,
      note: `external ${config.s3Endpoint}`,
    }
  return fakeState(spec(config))
}
