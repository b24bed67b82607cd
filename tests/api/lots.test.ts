import { QueryTypes } from 'sequelize'
import { beforeAll, describe, expect, it } from 'vitest'
import { isValidSerial, isoYearWeek } from '../../shared/serials'
import type { LotDto } from '../../shared/schemas/lots'
import { db, Document } from '../../server/models'
import { renderDocument } from '../../server/services/documents/documentRender'
import { getFile } from '../../server/storage'
import { signedInAs, signedInRoles } from './support/client'
import { buildSmallRecipe } from './support/recipes'

describe('lots', () => {
  const { engineer, lead } = signedInRoles('engineer', 'lead')
  let revId: string
  beforeAll(async () => {
    const rev = await buildSmallRecipe(engineer)
    await engineer.post(`/api/revisions/${rev.id}/release`).expect(200)
    revId = rev.id
  })

  it('plans a lot with a generated number, refuses a draft revision and bad quantities', async () => {
    const lot = (
      await lead
        .post('/api/lots', { revisionId: revId, quantity: 3, customerName: 'Test Co' })
        .expect(201)
    ).body as LotDto
    expect(lot.number).toMatch(/^L-\d{4,}$/)
    expect(lot).toMatchObject({
      status: 'planned',
      quantity: 3,
      customerName: 'Test Co',
      isOnHold: false,
    })
    const draft = await buildSmallRecipe(engineer)
    const refused = await lead.post('/api/lots', { revisionId: draft.id, quantity: 3 })
    expect(refused.status).toBe(400)
    expect(refused.body.fields).toEqual({ revisionId: 'choose a released revision' })
    const big = await lead.post('/api/lots', { revisionId: revId, quantity: 2001 })
    expect(big.body.fields.quantity).toMatch(/1 to 2000/)
    await lead.patch(`/api/lots/${lot.id}`, { quantity: 4, orderRef: 'PO-77' }).expect(200)
  })

  it('releases: allocates valid serials, queues the units at the first step, asks for documents', async () => {
    const lot = (await lead.post('/api/lots', { revisionId: revId, quantity: 5 }).expect(201))
      .body as LotDto
    const released = (await lead.post(`/api/lots/${lot.id}/release`).expect(200)).body as LotDto
    expect(released.status).toBe('released')
    expect(released.counts).toEqual({ queued: 5 })
    const units = (await lead.get(`/api/lots/${lot.id}/units`)).body
    expect(units).toHaveLength(5)
    for (const u of units) {
      expect(isValidSerial(u.serial)).toBe(true)
      expect(u.serial.split('-')[1]).toBe(isoYearWeek(new Date()))
      expect(u.currentStep.name).toBe('Winding')
    }
    const docs = (await lead.get(`/api/lots/${lot.id}/documents`)).body
    expect(docs.map((d: { kind: string }) => d.kind).sort()).toEqual(['labels', 'travelers'])
    expect((await lead.patch(`/api/lots/${lot.id}`, { quantity: 9 })).status).toBe(409)
    expect((await lead.post(`/api/lots/${lot.id}/release`)).status).toBe(409)
  })

  it('never repeats a serial when two leads release lots at the same moment', async () => {
    const lots = await Promise.all(
      [1, 2, 3, 4].map(() => lead.post('/api/lots', { revisionId: revId, quantity: 25 })),
    )
    const otherLead = await signedInAs('lead')
    const results = await Promise.all(
      lots.map((l, i) => (i % 2 ? otherLead : lead).post(`/api/lots/${l.body.id}/release`)),
    )
    expect(results.map((r) => r.status)).toEqual([200, 200, 200, 200])
    const [row] = await db().query<{ n: string; distinct_n: string }>(
      'SELECT count(*) AS n, count(DISTINCT serial) AS distinct_n FROM units WHERE lot_id IN (:ids)',
      { replacements: { ids: lots.map((l) => l.body.id) }, type: QueryTypes.SELECT },
    )
    expect(Number(row!.n)).toBe(100)
    expect(Number(row!.distinct_n)).toBe(100)
  })

  it('holds a lot with its open units and gives them back their state when released from hold', async () => {
    const lot = (await lead.post('/api/lots', { revisionId: revId, quantity: 2 }).expect(201))
      .body as LotDto
    await lead.post(`/api/lots/${lot.id}/release`).expect(200)
    const held = (
      await lead.post(`/api/lots/${lot.id}/hold`, { reason: 'core lot under review' }).expect(200)
    ).body as LotDto
    expect(held.isOnHold).toBe(true)
    expect(held.counts).toEqual({ on_hold: 2 })
    expect((await lead.post(`/api/lots/${lot.id}/hold`, { reason: 'again' })).status).toBe(409)
    const back = (
      await lead.post(`/api/lots/${lot.id}/unhold`, { reason: 'review passed' }).expect(200)
    ).body as LotDto
    expect(back.counts).toEqual({ queued: 2 })
    expect((await lead.post(`/api/lots/${lot.id}/close`)).status).toBe(409)
  })

  it('renders the travelers and label sheet into the object store, once however often it runs', async () => {
    const lot = (await lead.post('/api/lots', { revisionId: revId, quantity: 3 }).expect(201))
      .body as LotDto
    await lead.post(`/api/lots/${lot.id}/release`).expect(200)
    const docs = await Document.findAll({ where: { lotId: lot.id } })
    const seen: number[] = []
    for (const d of docs) await renderDocument(d.id, async (p) => void seen.push(p))
    const done = await Document.findAll({ where: { lotId: lot.id } })
    expect(done.map((d) => d.status)).toEqual(['done', 'done'])
    expect(seen.at(-1)).toBe(100)
    const travelers = done.find((d) => d.kind === 'travelers')!
    const first = { key: travelers.storageKey, sha: travelers.sha256 }
    await travelers.update({ status: 'queued' })
    await renderDocument(travelers.id, async () => {})
    await travelers.reload()
    expect({ key: travelers.storageKey, sha: travelers.sha256 }).toEqual(first)
    const file = await getFile(travelers.storageKey!)
    expect(file.body.subarray(0, 5).toString()).toBe('%PDF-')
    const download = await lead.get(`/api/documents/${travelers.id}/file`)
    expect(download.status).toBe(200)
    expect(download.headers['content-type']).toMatch(/pdf/)
  })
})
