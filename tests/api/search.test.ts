import { beforeAll, describe, expect, it } from 'vitest'
import { mod3736CheckCharacter } from '../../shared/checkCharacter'
import type { SearchKind, SearchResultsDto } from '../../shared/schemas/search'
import type { ServiceCaseDto } from '../../shared/schemas/shipping'
import { LOT_ROLES, signedInRoles, TestClient, uniqueSuffix } from './support/client'
import type { TestLot } from './support/floor'
import { releasedTestLot } from './support/floor'
import { shipTo } from './support/shipments'

const clients = signedInRoles(...LOT_ROLES, 'admin', 'service')
type Role = keyof typeof clients

let t: TestLot
let supplierLotCode: string
let shipmentNumber: string
let customerName: string
let returnNumber: string
let draftId: string

async function search(role: Role, q: string): Promise<SearchResultsDto> {
  const res = await clients[role].get(`/api/search?q=${encodeURIComponent(q)}`)
  expect(res.status, JSON.stringify(res.body)).toBe(200)
  return res.body as SearchResultsDto
}
const titles = (r: SearchResultsDto, kind: SearchKind) =>
  r.groups.find((g) => g.kind === kind)?.hits.map((h) => h.title) ?? []
const kinds = (r: SearchResultsDto) => r.groups.map((g) => g.kind)

beforeAll(async () => {
  t = await releasedTestLot(clients, 3)
  supplierLotCode = `SUP-${uniqueSuffix()}`
  await clients.stores
    .post('/api/component-lots', {
      partId: t.rev.bom[0]!.partId,
      supplierName: 'Orrin Ferrites',
      supplierLotCode,
      quantityReceived: 50,
      receivedOn: '2026-11-20',
    })
    .expect(201)
  customerName = `Quillmere Drives ${uniqueSuffix()}`
  const shipped = await shipTo([t.units[0]!.serial], customerName, 'buyer@quillmere.example')
  shipmentNumber = shipped.shipment.number
  const opened = await clients.service
    .post('/api/service-cases', {
      serial: t.units[0]!.serial,
      complaint: 'Output drops under load',
      receivedOn: '2026-12-03',
    })
    .expect(201)
  returnNumber = (opened.body as ServiceCaseDto).number
  const copy = await clients.engineer.post(`/api/revisions/${t.rev.id}/copy`).expect(201)
  draftId = copy.body.id
})

describe('GET /api/search', () => {
  it('finds each kind of record by its own code or name', async () => {
    const serial = t.units[1]!.serial
    expect(titles(await search('service', serial), 'unit')).toEqual([serial])
    expect(titles(await search('service', t.lot.number), 'lot')).toContain(t.lot.number)
    // A lot by its order reference too.
    expect(titles(await search('lead', t.lot.orderRef), 'lot')).toEqual([t.lot.number])
    expect(titles(await search('stores', t.componentLotCode), 'componentLot')).toEqual([
      t.componentLotCode,
    ])
    // The supplier's lot code finds the lot under Waymark's own code.
    const bySupplier = await search('stores', supplierLotCode.toLowerCase())
    expect(bySupplier.groups[0]!.hits[0]!.detail).toContain(supplierLotCode)
    expect(titles(await search('service', customerName.slice(0, 14)), 'customer')).toContain(
      customerName,
    )
    const code = t.rev.productCode
    expect(titles(await search('service', code), 'revision')).toContain(`${code} rev A`)
    expect(titles(await search('operator', `${code} rev A`), 'revision')[0]).toBe(`${code} rev A`)
    expect(titles(await search('service', shipmentNumber), 'shipment')).toEqual([shipmentNumber])
    expect(titles(await search('service', returnNumber), 'serviceCase')).toEqual([returnNumber])
  })

  it('finds a unit from part of its serial, and its return from its serial', async () => {
    const serial = t.units[0]!.serial
    const found = await search('lead', serial.slice(0, -3))
    expect(titles(found, 'unit')).toEqual(expect.arrayContaining(t.units.map((u) => u.serial)))
    const withReturn = await search('service', serial)
    expect(titles(withReturn, 'serviceCase')).toEqual([returnNumber])
    expect(withReturn.groups.find((g) => g.kind === 'unit')!.hits[0]!.detail).toContain('Returned')
  })

  it('finds a unit typed without its check character or with a wrong one, and says so', async () => {
    const serial = t.units[2]!.serial
    const body = serial.slice(0, -1)
    // mod3736CheckCharacter is checked against published ISO/IEC 7064 vectors in its unit test.
    expect(mod3736CheckCharacter(body)).toBe(serial.slice(-1))
    const wrong = body + (serial.endsWith('Z') ? 'Y' : 'Z')

    const added = (await search('service', body)).groups[0]!.hits[0]!
    expect(added).toMatchObject({ kind: 'unit', title: serial, note: 'check character added' })
    const corrected = (await search('service', wrong)).groups[0]!.hits[0]!
    expect(corrected).toMatchObject({ title: serial, note: 'check character corrected' })
    const exact = (await search('service', serial.toLowerCase())).groups[0]!.hits[0]!
    expect(exact).toMatchObject({ title: serial, note: null })
  })

  it('lists only the kinds each role may read, and drafts only for those who read drafts', async () => {
    const serial = t.units[1]!.serial
    // The operator reads no units, lots or customers: only released revisions.
    expect(kinds(await search('operator', serial))).toEqual([])
    expect(kinds(await search('operator', t.lot.number))).toEqual([])
    expect(kinds(await search('operator', shipmentNumber))).toEqual([])
    // Stores: component lots, not units.
    expect(kinds(await search('stores', serial))).toEqual([])
    expect(kinds(await search('stores', t.componentLotCode))).toEqual(['componentLot'])

    const code = t.rev.productCode
    const forEngineer = await search('engineer', code)
    expect(forEngineer.groups.find((g) => g.kind === 'revision')!.hits.map((h) => h.id)).toContain(
      draftId,
    )
    const forService = await search('service', code)
    expect(
      forService.groups.find((g) => g.kind === 'revision')!.hits.map((h) => h.id),
    ).not.toContain(draftId)
  })

  it("takes LIKE's wildcards literally", async () => {
    expect(kinds(await search('admin', '%%'))).toEqual([])
    expect(kinds(await search('admin', '__'))).toEqual([])
  })

  it('refuses a missing, short, long or broken q with a 400 naming q', async () => {
    for (const query of ['', '?q=', '?q=a', `?q=${'x'.repeat(81)}`, '?q=ab%00', '?q=ab&q=cd']) {
      const res = await clients.lead.get(`/api/search${query}`)
      expect(res.status, query).toBe(400)
      expect(res.body.fields, query).toHaveProperty('q')
    }
    await new TestClient().get('/api/search?q=L-0').expect(401)
  })
})
