import type { Queue } from 'bullmq'
import {
  STATUS_SERVICE_LABELS,
  type QueueStatusDto,
  type ServiceState,
  type ServiceStatusDto,
  type StatusService,
  type SystemStatusDto,
} from '../../../shared/schemas/status'
import { mailTransport } from '../../mail'
import { checkHealth, listUsers } from '../admin'
import { documentsQueue } from '../documents'
import { importsQueue } from '../imports'
import { listEmails, mailQueue } from '../mail'
import { alertsQueue } from '../quality'

/** How long one service or queue may take to answer before it counts as down. */
const ANSWER_MS = 2000
/** How many failed e-mails the page lists. */
const FAILED_EMAILS_SHOWN = 8

/** The background queues, as the page names them. */
const QUEUES: { label: string; queue: () => Queue }[] = [
  { label: 'Documents (PDFs)', queue: documentsQueue as () => Queue },
  { label: 'E-mail', queue: mailQueue as () => Queue },
  { label: 'Bench imports', queue: importsQueue as () => Queue },
  { label: 'Yield alerts', queue: alertsQueue as () => Queue },
]

function within<T>(work: Promise<T>, ms = ANSWER_MS): Promise<T> {
  return Promise.race([
    work,
    new Promise<never>((_, reject) =>
      setTimeout(() => reject(new Error(`no answer in ${ms / 1000} s`)), ms).unref(),
    ),
  ])
}

/**
 * Asks the mail relay whether it takes connections (SMTP EHLO, no message). A relay that was
 * never set up (no SMTP_URL and no local fake port) is `not_configured`, not down.
 */
async function checkSmtp(): Promise<Pick<ServiceStatusDto, 'state' | 'detail'>> {
  let transport: ReturnType<typeof mailTransport>
  try {
    transport = mailTransport()
  } catch (err) {
    return { state: 'not_configured', detail: (err as Error).message }
  }
  try {
    await within(transport.verify())
    return { state: 'ok', detail: 'accepts connections' }
  } catch (err) {
    return { state: 'down', detail: (err as Error).message }
  }
}

const service = (key: StatusService, state: ServiceState, detail: string): ServiceStatusDto => ({
  service: key,
  label: STATUS_SERVICE_LABELS[key],
  state,
  detail,
})

async function queueStatus({ label, queue }: (typeof QUEUES)[number]): Promise<QueueStatusDto> {
  const q = queue()
  try {
    const counts = await within(q.getJobCounts('waiting', 'active', 'delayed', 'failed'))
    return {
      name: q.name,
      label,
      waiting: counts.waiting ?? 0,
      active: counts.active ?? 0,
      delayed: counts.delayed ?? 0,
      failed: counts.failed ?? 0,
    }
  } catch {
    return { name: q.name, label, waiting: null, active: null, delayed: null, failed: null }
  }
}

/**
 * What an admin checks first: each service's health (the public health check's answers, plus the
 * mail relay), each job queue's counts, the latest e-mails given up, and every user's last
 * sign-in. Each part answers within 2 s or is reported as not answering; the page never hangs.
 */
export async function readSystemStatus(now = new Date()): Promise<SystemStatusDto> {
  const started = performance.now()
  const timedHealth = checkHealth().then((h) => ({ ...h, ms: performance.now() - started }))
  const [health, smtp, queues, failed, users] = await Promise.all([
    timedHealth,
    checkSmtp(),
    Promise.all(QUEUES.map(queueStatus)),
    listEmails({ status: 'failed', page: 1, pageSize: FAILED_EMAILS_SHOWN }),
    listUsers(),
  ])
  // The three are asked at once; the slowest answer bounds each.
  const answered = (state: 'ok' | 'down') =>
    state === 'ok'
      ? `answered within ${Math.max(1, Math.round(health.ms))} ms`
      : 'no answer within 2 s, or an error'
  const lastSignIn = (u: { lastSignInAt: string | null }) => u.lastSignInAt ?? ''
  return {
    checkedAt: now.toISOString(),
    version: health.version,
    services: [
      service('postgres', health.db, answered(health.db)),
      service('redis', health.redis, answered(health.redis)),
      service('storage', health.storage, answered(health.storage)),
      service('smtp', smtp.state, smtp.detail),
    ],
    queues,
    failedEmails: failed.rows,
    failedEmailTotal: failed.total,
    users: [...users].sort((a, b) => lastSignIn(b).localeCompare(lastSignIn(a))),
  }
}
