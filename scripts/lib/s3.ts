import { spawn } from 'node:child_process'
import {
  closeSync,
  existsSync,
  mkdirSync,
  openSync,
  readFileSync,
  rmSync,
  writeFileSync,
} from 'node:fs'
import { CreateBucketCommand, S3Client } from '@aws-sdk/client-s3'
import type { ServiceConfig } from './serviceConfig'
import type { ServiceState } from './postgres'
import { isAlive, isPortOpen, livePid, ServiceError, waitFor } from './proc'

type Log = (line: string) => void

const MARK = 's3Fake'

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

/** Runs the S3 fake in the background (own process group, so Ctrl-C elsewhere spares it). */
export async function startS3(config: ServiceConfig, log: Log): Promise<void> {
  if (config.isS3External) {
    log(`s3: using S3_ENDPOINT=${config.s3Endpoint} (no local fake)`)
    return
  }
  mkdirSync(config.s3Dir, { recursive: true, mode: 0o700 })
  const running = livePid(config.s3PidFile, MARK)
  if (running && (await isPortOpen(config.s3Port))) {
    await createBuckets(config)
    log(`s3: already running on ${config.host}:${config.s3Port} (pid ${running})`)
    return
  }
  if (running)
    throw new ServiceError(`s3: pid ${running} is alive but port ${config.s3Port} does not answer`)
  rmSync(config.s3PidFile, { force: true })
  if (await isPortOpen(config.s3Port)) {
    throw new ServiceError(
      `s3: port ${config.s3Port} is taken by another program; set WAYMARK_S3_PORT`,
    )
  }
  const logFd = openSync(config.s3LogFile, 'a')
  // `node --import tsx` keeps it one process, so the pid we record is the server itself.
  const child = spawn(process.execPath, ['--import', 'tsx', 'scripts/s3Fake.ts'], {
    cwd: config.repoRoot,
    detached: true,
    stdio: ['ignore', logFd, logFd],
    env: { ...process.env, WAYMARK_S3_PORT: String(config.s3Port), WAYMARK_S3_DIR: config.s3Dir },
  })
  closeSync(logFd)
  const pid = child.pid
  if (!pid) throw new ServiceError('s3: could not spawn the fake')
  child.unref()
  writeFileSync(config.s3PidFile, `${pid}\n`)
  if (
    !(await waitFor(async () => !isAlive(pid) || (await isPortOpen(config.s3Port)), 20000)) ||
    !isAlive(pid)
  ) {
    const tail = existsSync(config.s3LogFile)
      ? readFileSync(config.s3LogFile, 'utf8').split('\n').slice(-8)
      : []
    rmSync(config.s3PidFile, { force: true })
    throw new ServiceError(`s3: the fake did not start:\n${tail.join('\n')}`)
  }
  await createBuckets(config)
  log(
    `s3: started on ${config.host}:${config.s3Port} (pid ${pid}); buckets ${config.buckets.join(', ')}`,
  )
}

/** Stops the fake named in our pid file. */
export async function stopS3(config: ServiceConfig, log: Log): Promise<void> {
  if (config.isS3External) return
  const pid = livePid(config.s3PidFile, MARK)
  if (!pid) {
    rmSync(config.s3PidFile, { force: true })
    log('s3: not running')
    return
  }
  process.kill(pid, 'SIGTERM')
  if (!(await waitFor(() => !isAlive(pid), 5000))) process.kill(pid, 'SIGKILL')
  await waitFor(() => !isAlive(pid), 2000)
  rmSync(config.s3PidFile, { force: true })
  log(`s3: stopped (pid ${pid})`)
}

export function s3State(config: ServiceConfig): ServiceState {
  if (config.isS3External) {
    return {
      name: 's3',
      isRunning: true,
      port: config.s3Port,
      pid: null,
      note: `external ${config.s3Endpoint}`,
    }
  }
  const pid = livePid(config.s3PidFile, MARK)
  return { name: 's3', isRunning: !!pid, port: config.s3Port, pid }
}
