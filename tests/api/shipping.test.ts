import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import type { DocumentDto, UnitSummaryDto } from '../../shared/schemas/lots'
import type { EmailDto, OutboxPageDto } from '../../shared/schemas/outbox'
import type { CustomerDto, ServiceCaseDto, ShipmentDto } from '../../shared/schemas/shipping'
import { limitNumber } from '../../shared/recipes/limitText'
import { AuditEvent, Check, Email, Measurement, Shipment, StepRun, Unit } from '../../server/models'
import { renderDocument } from '../../server/services/documents/documentRender'
import { LOT_ROLES, signedInAs, signedInRoles, uniqueSuffix } from './support/client'
import { binary, pdfText } from './support/pdf'
import { loadTestRun, releasedTestLot, windingRun } from './support/floor'
import type { TestLot } from './support/floor'
import { startMailRig } from './support/mailRig'

vi.hoisted(() => {
  process.env.WAYMARK_MAIL_ATTEMPTS = '2'
  process.env.WAYMARK_MAIL_BACKOFF_MS = '100'
})

async function waitFor<T>(probe: () => Promise<T | null | undefined>, what: string): Promise<T> {
  const deadline = Date.now() + 15_000
  for (;;) {
    const found = await probe()
    if (found) return found
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`)
    await new Promise((r) => setTimeout(r, 100))
  }
}

describe('customers, shipments, certificates, e-mail and returns', () => {
  const { engineer, lead, stores, operator, service } = signedInRoles(...LOT_ROLES, 'service')
  let t: TestLot
  let customer: CustomerDto
  /** Three units that passed both steps; the fourth only passed winding. */
  let passed: string[]
  let unfinished: string
  let mailRig: Awaited<ReturnType<typeof startMailRig>>

  const passUnit = async (serial: string) => {
    await operator.post('/api/step-runs', windingRun(t, serial)).expect(201)
    await operator.post('/api/step-runs', loadTestRun(serial, 350.4)).expect(201)
  }
  const unitState = async (serial: string) => (await Unit.findOne({ where: { serial } }))!.state

  beforeAll(async () => {
    mailRig = await startMailRig()
    t = await releasedTestLot({ engineer, lead, stores }, 4)
    const serials = t.units.map((u) => u.serial)
    passed = serials.slice(0, 3)
    unfinished = serials[3]!
    for (const s of passed) await passUnit(s)
    await operator.post('/api/step-runs', windingRun(t, unfinished)).expect(201)
    customer = (
      await service
        .post('/api/customers', {
          name: `Brackwater Traction ${uniqueSuffix()}`,
          contactEmail: `Buyer.${uniqueSuffix()}@brackwater.example`,
          address: '2 Quay Street\nBrackwater',
        })
        .expect(201)
    ).body as CustomerDto
  })

  afterAll(() => mailRig.stop())

  describe('customers', () => {
    it('refuses bad input with a 4xx naming the field', async () => {
      const noName = await lead.post('/api/customers', { name: ' ', contactEmail: '' })
      expect(noName.status).toBe(400)
      expect(noName.body.fields).toHaveProperty('name')
      const badMail = await lead.post('/api/customers', { name: 'Okay Name', contactEmail: 'nope' })
      expect(badMail.status).toBe(400)
      expect(badMail.body.fields).toHaveProperty('contactEmail')
      const same = await lead.post('/api/customers', { name: customer.name.toUpperCase() })
      expect(same.status).toBe(409)
      expect(same.body.fields).toEqual({ name: 'already in use' })
      const badPatch = await lead.patch(`/api/customers/${customer.id}`, { contactEmail: 'x@' })
      expect(badPatch.status).toBe(400)
      expect(badPatch.body.fields).toHaveProperty('contactEmail')
    })

    it('stores the e-mail in lower case and lets only lead, service and admin edit', async () => {
      expect(customer.contactEmail).toBe(customer.contactEmail.toLowerCase())
      await operator.post('/api/customers', { name: 'Not Allowed Ltd' }).expect(403)
      await engineer.patch(`/api/customers/${customer.id}`, { address: 'x' }).expect(403)
      await engineer.get(`/api/customers/${customer.id}`).expect(200)
    })

    it('links a lot to a customer and keeps the lot’s customer name in step', async () => {
      const lot = await lead
        .post('/api/lots', {
          revisionId: t.rev.id,
          quantity: 1,
          customerName: 'typed text is overruled',
          customerId: customer.id,
        })
        .expect(201)
      expect(lot.body).toMatchObject({ customerId: customer.id, customerName: customer.name })
      const renamed = `${customer.name} Ltd`
      await lead.patch(`/api/customers/${customer.id}`, { name: renamed }).expect(200)
      expect((await lead.get(`/api/lots/${lot.body.id}`)).body.customerName).toBe(renamed)
      customer = (await lead.get(`/api/customers/${customer.id}`)).body as CustomerDto
      expect(customer.lotCount).toBe(1)
      const bad = await lead.post('/api/lots', {
        revisionId: t.rev.id,
        quantity: 1,
        customerId: '00000000-0000-4000-8000-000000000000',
      })
      expect(bad.status).toBe(400)
      expect(bad.body.fields).toHaveProperty('customerId')
    })
  })

  describe('shipments', () => {
    let shipment: ShipmentDto

    it('checks each scan at once: a finished unit may ship, an unfinished one says why', async () => {
      const ok = (await service.get(`/api/shipments/units/${passed[0]}`).expect(200)).body
      expect(ok).toMatchObject({ serial: passed[0], state: 'passed', refusal: null })
      const url = `https://waymark.example.com/u/${unfinished}`
      const no = (await service.get(`/api/shipments/units/${encodeURIComponent(url)}`)).body
      expect(no.state).toBe('in_progress')
      expect(no.refusal).toMatch(/not passed/)
      await service.get('/api/shipments/units/NOPE-0000-00000').expect(404)
    })

    it('refuses a unit that has not passed its route, names it, and saves nothing', async () => {
      const before = await Shipment.count()
      const audits = await AuditEvent.count({ where: { action: 'shipment.create' } })
      const res = await lead.post('/api/shipments', {
        customerId: customer.id,
        shippedOn: '2026-12-02',
        serials: [passed[0], unfinished, 'NOPE-0000-00000'],
      })
      expect(res.status).toBe(409)
      expect(res.body.error).toBe('units_not_shippable')
      expect(res.body.details).toEqual([
        `${unfinished}: in_progress (it is in progress, not passed: only a unit that passed its whole route ships)`,
        'NOPE-0000-00000: no such unit',
      ])
      expect(await Shipment.count()).toBe(before)
      expect(await AuditEvent.count({ where: { action: 'shipment.create' } })).toBe(audits)
      expect(await unitState(passed[0]!)).toBe('passed')
    })

    it('refuses bad input naming the field, and roles that do not pack', async () => {
      const noSerials = await lead.post('/api/shipments', {
        customerId: customer.id,
        shippedOn: '2026-12-02',
        serials: [],
      })
      expect(noSerials.status).toBe(400)
      expect(noSerials.body.fields).toHaveProperty('serials')
      const twice = await lead.post('/api/shipments', {
        customerId: customer.id,
        shippedOn: '2026-12-02',
        serials: [passed[0], passed[0]!.toLowerCase()],
      })
      expect(twice.status).toBe(400)
      expect(twice.body.fields).toHaveProperty('serials')
      const body = { customerId: customer.id, shippedOn: '2026-12-02', serials: [passed[0]] }
      await operator.post('/api/shipments', body).expect(403)
      await engineer.post('/api/shipments', body).expect(403)
    })

    it('ships passed units: they become shipped, it is audited, a packing slip is made', async () => {
      const res = await service.post('/api/shipments', {
        customerId: customer.id,
        orderRef: 'PO-7781',
        carrier: 'Tarn Valley Freight',
        tracking: 'TVF 1',
        shippedOn: '2026-12-02',
        serials: passed.slice(0, 2),
      })
      expect(res.status).toBe(201)
      shipment = res.body as ShipmentDto
      expect(shipment.number).toMatch(/^S-\d{4}$/)
      expect(shipment.units.map((u) => u.serial)).toEqual([...passed.slice(0, 2)].sort())
      expect(shipment.units.every((u) => u.state === 'shipped')).toBe(true)
      for (const s of passed.slice(0, 2)) expect(await unitState(s)).toBe('shipped')
      const audit = await AuditEvent.findOne({
        where: { action: 'shipment.create', entityId: shipment.id },
      })
      expect((audit!.after as { serials: string[] }).serials.sort()).toEqual(
        [...passed.slice(0, 2)].sort(),
      )
      const slip = shipment.documents.find((d) => d.kind === 'packing_slip')!
      expect(slip.filename).toBe(`${shipment.number}-packing-slip.pdf`)
      await renderDocument(slip.id, async () => {})
      const file = await binary(lead.get(`/api/documents/${slip.id}/file`)).expect(200)
      const text = await pdfText(file.body as Buffer)
      expect(text).toContain(`Packing slip`)
      expect(text).toContain(customer.name)
      expect(text).toContain('TVF 1')
      for (const s of passed.slice(0, 2)) expect(text).toContain(s)
      // A unit ships once until it comes back.
      const again = await lead.post('/api/shipments', {
        customerId: customer.id,
        shippedOn: '2026-12-02',
        serials: [passed[0]],
      })
      expect(again.status).toBe(409)
      expect(again.body.details[0]).toMatch(/shipped/)
      const list = (await engineer.get(`/api/shipments?customerId=${customer.id}`)).body
      expect(list.map((s: { id: string }) => s.id)).toContain(shipment.id)
    })

    it('makes a certificate whose text carries the recorded values against their limits', async () => {
      const made = await service.post(`/api/shipments/${shipment.id}/certificate`).expect(201)
      const doc = made.body as DocumentDto
      expect(doc).toMatchObject({ kind: 'certificate', status: 'queued' })
      await renderDocument(doc.id, async () => {})
      const file = await binary(service.get(`/api/documents/${doc.id}/file`)).expect(200)
      const text = await pdfText(file.body as Buffer)
      expect(text).toContain(`Certificate of conformance`)
      expect(text).toContain(`built and tested to ${t.rev.productCode} revision ${t.rev.letter}`)
      expect(text).toContain('safety standards and local codes govern')
      expect(text).toContain('Priya Venn') // the demo service user who asked for it
      expect(text).toContain(t.lot.number)
      // Every value recorded in the units' runs appears, rounded as the check says, with limits.
      for (const serial of passed.slice(0, 2)) {
        expect(text).toContain(serial)
        const unit = (await Unit.findOne({ where: { serial } }))!
        const runs = await StepRun.findAll({ where: { unitId: unit.id, result: 'pass' } })
        const values = await Measurement.findAll({ where: { stepRunId: runs.map((r) => r.id) } })
        expect(values.length).toBeGreaterThan(1)
        for (const v of values) {
          const check = (await Check.findByPk(v.checkId))!
          // Turn counts are internal unless marked for customers (tests/api/checkStatistics.test.ts).
          if (!check.isForCustomers) continue
          const printed = `${limitNumber(v.valueNumber!, check.decimals)} ${check.unit}`
          expect(text).toContain(printed)
        }
      }
      expect(text).toContain('345–355 V') // the load test's limits, as the recipe sets them
    })
  })

  describe('e-mailing a document', () => {
    it('queues a finished certificate to the customer’s contact, and the fake files a receipt', async () => {
      const shipment = (await Shipment.findOne({ where: { customerId: customer.id } }))!
      const detail = (await service.get(`/api/shipments/${shipment.id}`)).body as ShipmentDto
      const cert = detail.documents.find((d) => d.kind === 'certificate' && d.status === 'done')!
      const draft = (await service.get(`/api/documents/${cert.id}/email-draft`).expect(200)).body
      expect(draft.to).toEqual([customer.contactEmail])
      const res = await service.post(`/api/documents/${cert.id}/email`, {
        note: 'As promised on the phone.',
      })
      expect(res.status).toBe(202)
      const queued = res.body as EmailDto
      expect(queued).toMatchObject({ status: 'queued', to: [customer.contactEmail] })
      expect(queued.attachments).toEqual([
        { filename: cert.filename, contentType: 'application/pdf', size: cert.size },
      ])
      expect(
        await AuditEvent.count({ where: { action: 'document.email', entityId: cert.id } }),
      ).toBe(1)
      // The fake files its copy as a delivery receipt on the sent row (matched by Message-ID).
      const receipted = await waitFor(async () => {
        const e = await Email.findByPk(queued.id)
        return e?.receiptAt ? e : null
      }, 'the fake SMTP server to file the message')
      expect(receipted.toAddresses).toEqual([customer.contactEmail])
      expect(receipted.textBody).toContain('As promised on the phone.')
      expect(await Email.count({ where: { status: 'received', subject: queued.subject } })).toBe(0)
      const admin = await signedInAs('admin')
      const page = (await admin.get('/api/outbox?pageSize=200')).body as OutboxPageDto
      const row = page.rows.find((r) => r.id === queued.id)!
      expect(row.attachmentCount).toBe(1)
      expect(row.receiptAt).not.toBeNull()
      const pdf = await binary(admin.get(`/api/outbox/${row.id}/attachments/0`)).expect(200)
      const text = await pdfText(pdf.body as Buffer)
      expect(text).toContain('Certificate of conformance')
      expect(text).toContain(detail.units[0]!.serial)
      expect((await Email.findByPk(queued.id))!.status).toBe('sent')
    })

    it('refuses roles by the document’s kind, unfinished documents and bad recipients', async () => {
      const shipment = (await Shipment.findOne({ where: { customerId: customer.id } }))!
      const detail = (await service.get(`/api/shipments/${shipment.id}`)).body as ShipmentDto
      const cert = detail.documents.find((d) => d.kind === 'certificate')!
      await engineer.post(`/api/documents/${cert.id}/email`, {}).expect(403)
      await operator.post(`/api/documents/${cert.id}/email`, {}).expect(403)
      const bad = await service.post(`/api/documents/${cert.id}/email`, { to: ['not-an-address'] })
      expect(bad.status).toBe(400)
      expect(Object.keys(bad.body.fields)[0]).toMatch(/^to/)
      const pending = await service.post(`/api/shipments/${shipment.id}/certificate`).expect(201)
      const notYet = await service.post(`/api/documents/${pending.body.id}/email`, {})
      expect(notYet.status).toBe(409)
      expect(notYet.body.error).toBe('document_not_ready')
    })

    it('makes a certificate for one serial, and refuses one that has not passed', async () => {
      const one = await service.post(`/api/units/${passed[2]}/certificate`).expect(201)
      await renderDocument(one.body.id, async () => {})
      const file = await binary(service.get(`/api/documents/${one.body.id}/file`)).expect(200)
      const text = await pdfText(file.body as Buffer)
      expect(text).toContain(`the unit listed above was built and tested`)
      expect(text).toContain(passed[2])
      const refused = await service.post(`/api/units/${unfinished}/certificate`)
      expect(refused.status).toBe(409)
      const docs = (await service.get(`/api/units/${passed[2]}/documents`)).body as DocumentDto[]
      expect(docs.map((d) => d.id)).toContain(one.body.id)
    })
  })

  describe('returns', () => {
    let repairCase: ServiceCaseDto

    it('opens a case only for a shipped unit; the unit becomes returned', async () => {
      const notShipped = await service.post('/api/service-cases', {
        serial: unfinished,
        complaint: 'Hums loudly',
        receivedOn: '2026-12-02',
      })
      expect(notShipped.status).toBe(409)
      expect(notShipped.body.fields.serial).toMatch(/in progress/)
      const bad = await service.post('/api/service-cases', { serial: passed[0], complaint: '' })
      expect(bad.status).toBe(400)
      expect(bad.body.fields).toHaveProperty('complaint')
      expect(bad.body.fields).toHaveProperty('receivedOn')
      await operator
        .post('/api/service-cases', { serial: passed[0], complaint: 'x', receivedOn: '2026-12-02' })
        .expect(403)
      const res = await service.post('/api/service-cases', {
        serial: passed[0],
        complaint: 'No output after a week in service',
        receivedOn: '2026-12-02',
      })
      expect(res.status).toBe(201)
      repairCase = res.body as ServiceCaseDto
      expect(repairCase).toMatchObject({
        status: 'open',
        unitState: 'returned',
        customerId: customer.id,
        customerName: customer.name,
      })
      expect(repairCase.shipmentNumber).toMatch(/^S-/)
      expect(await unitState(passed[0]!)).toBe('returned')
      expect(
        await AuditEvent.count({ where: { action: 'service_case.open', entityId: repairCase.id } }),
      ).toBe(1)
      const again = await service.post('/api/service-cases', {
        serial: passed[0],
        complaint: 'Same again',
        receivedOn: '2026-12-02',
      })
      expect(again.status).toBe(409)
    })

    it('records findings and a defect code', async () => {
      const codes = (await service.get('/api/defect-codes')).body as { id: string }[]
      const res = await service.patch(`/api/service-cases/${repairCase.id}`, {
        findings: 'Output rectifier open circuit',
        defectCodeId: codes[0]!.id,
      })
      expect(res.status).toBe(200)
      expect(res.body.findings).toBe('Output rectifier open circuit')
      expect(res.body.defectCodeId).toBe(codes[0]!.id)
      const bad = await service.patch(`/api/service-cases/${repairCase.id}`, {
        defectCodeId: 'nope',
      })
      expect(bad.status).toBe(400)
      expect(bad.body.fields).toHaveProperty('defectCodeId')
    })

    it('repairs through the rework route: in_rework at the chosen step, rework count up', async () => {
      await engineer
        .post(`/api/service-cases/${repairCase.id}/close`, { resolution: 'credit' })
        .expect(403)
      const noStep = await lead.post(`/api/service-cases/${repairCase.id}/close`, {
        resolution: 'repair',
      })
      expect(noStep.status).toBe(400)
      expect(noStep.body.fields).toHaveProperty('reworkToStepId')
      const loadStep = t.rev.steps[1]!
      const res = await lead.post(`/api/service-cases/${repairCase.id}/close`, {
        resolution: 'repair',
        reworkToStepId: loadStep.id,
      })
      expect(res.status).toBe(200)
      expect(res.body).toMatchObject({
        status: 'closed',
        resolution: 'repair',
        reworkToStepName: loadStep.name,
        unitState: 'in_rework',
      })
      const units = (await lead.get(`/api/lots/${t.lot.id}/units`)).body as UnitSummaryDto[]
      expect(units.find((u) => u.serial === passed[0])).toMatchObject({
        state: 'in_rework',
        reworkCount: 1,
        currentStep: { id: loadStep.id },
      })
      expect(
        await AuditEvent.count({
          where: { action: 'service_case.close', entityId: repairCase.id },
        }),
      ).toBe(1)
      // The Floor takes it at the load test; once it passes it may ship again.
      await operator.post('/api/step-runs', loadTestRun(passed[0]!, 350.1)).expect(201)
      expect(await unitState(passed[0]!)).toBe('passed')
      await service
        .post('/api/shipments', {
          customerId: customer.id,
          shippedOn: '2026-12-03',
          serials: [passed[0]],
        })
        .expect(201)
      const closed = await lead.post(`/api/service-cases/${repairCase.id}/close`, {
        resolution: 'credit',
      })
      expect(closed.status).toBe(409)
    })

    it('replaces with a passed serial, shipped to the same customer', async () => {
      const opened = await service
        .post('/api/service-cases', {
          serial: passed[1],
          complaint: 'Case dented in transit',
          receivedOn: '2026-12-02',
        })
        .expect(201)
      const notPassed = await service.post(`/api/service-cases/${opened.body.id}/close`, {
        resolution: 'replace',
        replacementSerial: unfinished,
      })
      expect(notPassed.status).toBe(409)
      expect(notPassed.body.fields).toHaveProperty('replacementSerial')
      const missing = await service.post(`/api/service-cases/${opened.body.id}/close`, {
        resolution: 'replace',
      })
      expect(missing.status).toBe(400)
      expect(missing.body.fields).toHaveProperty('replacementSerial')
      const res = await service.post(`/api/service-cases/${opened.body.id}/close`, {
        resolution: 'replace',
        replacementSerial: passed[2],
      })
      expect(res.status).toBe(200)
      expect(res.body).toMatchObject({ replacementSerial: passed[2], unitState: 'returned' })
      expect(await unitState(passed[2]!)).toBe('shipped')
      const list = (await service.get(`/api/shipments?customerId=${customer.id}`)).body
      expect(
        list.find(
          (s: { orderRef: string }) => s.orderRef === `Replacement for ${opened.body.number}`,
        ),
      ).toBeTruthy()
      const cases = (await service.get(`/api/service-cases?lotId=${t.lot.id}`)).body
      expect(cases).toHaveLength(2)
    })
  })
})
