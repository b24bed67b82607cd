import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import type { SystemStatusDto } from '../../shared/schemas/status'
import { setSmtpPortForTests } from '../../server/mail'
import { AuditEvent, db, Email, User } from '../../server/models'
import type { Actor } from '../../server/services/admin'
import { closeImportsQueue, importsQueue } from '../../server/services/imports'
import { queueEmail } from '../../server/services/mail'
import { resetSignInLimits, signedInAs, uniqueSuffix } from './support/client'
import type { TestClient } from './support/client'
import { closedPort, startMailRig, waitForEmailStatus } from './support/mailRig'

// One quick attempt, so an e-mail to a closed port fails in well under a second.
vi.hoisted(() => {
  process.env.WAYMARK_MAIL_ATTEMPTS = '1'
  process.env.WAYMARK_MAIL_BACKOFF_MS = '100'
})

let rig: Awaited<ReturnType<typeof startMailRig>>
let admin: TestClient
let actor: Actor

async function readStatus(): Promise<SystemStatusDto> {
  return (await admin.get('/api/status').expect(200)).body as SystemStatusDto
}

async function queueOne(subject: string): Promise<string> {
  return db().transaction(async (transaction) => {
    const email = await queueEmail(
      { to: ['planning@customer.example'], subject, text: 'The lot report is attached.' },
      actor,
      transaction,
    )
    return email.id
  })
}

beforeAll(async () => {
  await resetSignInLimits()
  rig = await startMailRig()
  setSmtpPortForTests(await closedPort())
  admin = await signedInAs('admin')
  const user = (await User.findOne({ where: { email: 'admin@ferncastle.example' } }))!
  actor = { id: user.id, email: user.email }
})

afterAll(() => rig.stop(closeImportsQueue))

describe('GET /api/status', () => {
  it('is for admins only', async () => {
    for (const role of ['lead', 'engineer', 'operator', 'stores', 'service'])
      await (await signedInAs(role)).get('/api/status').expect(403)
  })

  it("reports each service's health, the mail relay down while its port is closed", async () => {
    const status = await readStatus()
    expect(status.services.map((s) => [s.service, s.state])).toEqual([
      ['postgres', 'ok'],
      ['redis', 'ok'],
      ['storage', 'ok'],
      ['smtp', 'down'],
    ])
    setSmtpPortForTests(rig.fake.port)
    try {
      const smtp = (await readStatus()).services.find((s) => s.service === 'smtp')!
      expect(smtp).toMatchObject({ state: 'ok', label: 'Mail relay (SMTP)' })
    } finally {
      setSmtpPortForTests(await closedPort())
    }
  })

  it('counts the jobs of each queue', async () => {
    const before = await readStatus()
    expect(before.queues.map((q) => q.name)).toEqual(['documents', 'mail', 'imports', 'alerts'])
    const importsBefore = before.queues.find((q) => q.name === 'imports')!
    // A job due in an hour waits as delayed; no worker of this file takes import jobs anyway.
    const job = await importsQueue().add('run', { importId: randomUUID() } as never, {
      delay: 3_600_000,
      jobId: `status-test-${uniqueSuffix()}`,
    })
    try {
      const during = (await readStatus()).queues.find((q) => q.name === 'imports')!
      expect(during.delayed).toBe(importsBefore.delayed! + 1)
      expect(during.waiting).toBe(importsBefore.waiting)
    } finally {
      await job.remove()
    }
    const after = (await readStatus()).queues.find((q) => q.name === 'imports')!
    expect(after.delayed).toBe(importsBefore.delayed)
  })

  it('lists users with their last sign-in, the latest first', async () => {
    const { users } = await readStatus()
    const me = users.find((u) => u.email === 'admin@ferncastle.example')!
    expect(me.lastSignInAt).not.toBeNull()
    const times = users.map((u) => u.lastSignInAt ?? '')
    expect(times).toEqual([...times].sort().reverse())
    expect(users[0]).not.toHaveProperty('passwordHash')
  })
})

describe('retrying a failed e-mail from the status page', () => {
  it('lists a failed e-mail, and sends it again once the relay is back', async () => {
    const subject = `Lot report ${uniqueSuffix()}`
    const id = await queueOne(subject)
    const failed = await waitForEmailStatus(id, 'failed')
    expect(failed.status).toBe('failed')

    const listed = await readStatus()
    expect(listed.failedEmailTotal).toBeGreaterThanOrEqual(1)
    expect(listed.failedEmails.find((m) => m.id === id)).toMatchObject({ subject, attempts: 1 })
    expect(listed.queues.find((q) => q.name === 'mail')!.failed).toBeGreaterThanOrEqual(1)

    setSmtpPortForTests(rig.fake.port)
    try {
      // The queue still holds the failed job under the e-mail's id; the retry must not be
      // swallowed as a duplicate of it.
      const res = await admin.post(`/api/outbox/${id}/retry`).expect(200)
      expect(res.body).toMatchObject({ id, status: 'queued', error: null })
      const sent = await waitForEmailStatus(id, 'sent')
      expect(sent.status).toBe('sent')
      expect(sent.attempts).toBe(2)
    } finally {
      setSmtpPortForTests(await closedPort())
    }
    const audit = await AuditEvent.findOne({ where: { action: 'email.retry', entityId: id } })
    expect(audit?.actorEmail).toBe('admin@ferncastle.example')
    expect(audit?.before).toMatchObject({ status: 'failed' })
    expect((await readStatus()).failedEmails.map((m) => m.id)).not.toContain(id)

    // Sent is sent: a second retry is refused and changes nothing.
    const again = await admin.post(`/api/outbox/${id}/retry`)
    expect(again.status).toBe(409)
    expect(again.body.error).toBe('email_not_failed')
    expect((await Email.findByPk(id))!.status).toBe('sent')
  })

  it('lets only admin and service retry, and names a bad id', async () => {
    const id = await queueOne(`Refused ${uniqueSuffix()}`)
    expect((await waitForEmailStatus(id, 'failed')).status).toBe('failed')
    for (const role of ['lead', 'engineer', 'operator', 'stores'])
      await (await signedInAs(role)).post(`/api/outbox/${id}/retry`).expect(403)
    expect((await Email.findByPk(id))!.status).toBe('failed')
    const bad = await admin.post('/api/outbox/not-an-id/retry')
    expect(bad.status).toBe(400)
    expect(bad.body.fields).toHaveProperty('id')
    await admin.post(`/api/outbox/${randomUUID()}/retry`).expect(404)
  })
})
