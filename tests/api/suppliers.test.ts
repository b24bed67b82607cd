import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Sequelize } from 'sequelize'
import type { ComponentLotDto } from '../../shared/schemas/componentLots'
import type { SupplierDto } from '../../shared/schemas/suppliers'
import { ownerConnection } from '../../server/db/migrator'
import type { MigrationContext } from '../../server/db/migrator'
import { up } from '../../server/db/migrations/20261205130700-create-suppliers'
import { AuditEvent } from '../../server/models'
import { signedInAs, signedInRoles, uniqueSuffix } from './support/client'
import { releasedTestLot, windingRun } from './support/floor'

describe('suppliers are records', () => {
  const { stores, lead } = signedInRoles('stores', 'lead')
  let partId: string
  /** A supplier name no other run has used. */
  const fresh = () => `Brindle Wire ${uniqueSuffix()} Co.`

  const receive = (supplierName: string, over: Record<string, unknown> = {}) =>
    stores.post('/api/component-lots', {
      partId,
      supplierName,
      supplierLotCode: `SU-${uniqueSuffix()}`,
      quantityReceived: 10,
      receivedOn: '2026-11-20',
      ...over,
    })

  beforeAll(async () => {
    partId = (
      await stores
        .post('/api/parts', { partNumber: `SP-${uniqueSuffix()}`, description: 'Enamelled wire' })
        .expect(201)
    ).body.id
  })

  it('meets spellings of one name in one record, added once and audited', async () => {
    const name = fresh()
    const a = (await receive(name).expect(201)).body as ComponentLotDto
    const b = (await receive(`  ${name.toUpperCase().replace(/ /g, '   ')} `).expect(201))
      .body as ComponentLotDto
    expect(b.supplierId).toBe(a.supplierId)
    // The record keeps the first spelling; every lot shows the record's name.
    expect(b.supplierName).toBe(name)
    const created = await AuditEvent.findAll({
      where: { entityId: a.supplierId, action: 'supplier.create' },
    })
    expect(created).toHaveLength(1)
    expect(created[0]!.after).toEqual({ name })
    const found = (await stores.get(`/api/suppliers?q=${encodeURIComponent(name.toLowerCase())}`))
      .body as SupplierDto[]
    expect(found).toEqual([{ id: a.supplierId, name, lotCount: 2 }])
  })

  it('gives one record to a new name received many times at once', async () => {
    const name = fresh()
    const spellings = Array.from({ length: 6 }, (_, i) =>
      i % 2 ? name.toLowerCase() : ` ${name} `,
    )
    const results = await Promise.all(spellings.map((s) => receive(s)))
    expect(results.map((r) => r.status)).toEqual(spellings.map(() => 201))
    const ids = new Set(results.map((r) => (r.body as ComponentLotDto).supplierId))
    expect(ids.size).toBe(1)
    const created = await AuditEvent.count({
      where: { entityId: [...ids][0]!, action: 'supplier.create' },
    })
    expect(created).toBe(1)
  })

  it('adds a supplier by name, answering the existing record for a known one', async () => {
    const name = fresh()
    const added = await stores.post('/api/suppliers', { name: `${name}  ` }).expect(201)
    expect(added.body).toMatchObject({ name, lotCount: 0 })
    const again = await stores.post('/api/suppliers', { name: name.toLowerCase() }).expect(200)
    expect(again.body.id).toBe(added.body.id)
    const blank = await stores.post('/api/suppliers', { name: '   ' })
    expect(blank.status).toBe(400)
    expect(blank.body.fields).toEqual({ name: 'enter the supplier' })
    const nothing = await receive('  ')
    expect(nothing.status).toBe(400)
    expect(nothing.body.fields).toEqual({ supplierName: 'enter the supplier' })
    // Suggestions match a typed wildcard literally.
    expect((await stores.get('/api/suppliers?q=%25%25%25').expect(200)).body).toEqual([])
  })

  it('moves a lot to another supplier record when stores correct its supplier', async () => {
    const lot = (await receive(fresh()).expect(201)).body as ComponentLotDto
    const other = fresh()
    const fixed = await stores
      .patch(`/api/component-lots/${lot.id}`, { supplierName: other })
      .expect(200)
    expect(fixed.body.supplierName).toBe(other)
    expect(fixed.body.supplierId).not.toBe(lot.supplierId)
    const audit = await AuditEvent.findOne({
      where: { entityId: lot.id, action: 'component_lot.update' },
    })
    expect(audit?.after).toMatchObject({ supplierName: other })
    // The list's search box finds lots by the supplier record's name.
    const listed = await stores
      .get(`/api/component-lots?q=${encodeURIComponent(other.toLowerCase())}`)
      .expect(200)
    expect(listed.body.rows.map((r: ComponentLotDto) => r.id)).toEqual([lot.id])
  })

  it('shows the supplier record’s name in trace and recall', async () => {
    const engineer = await signedInAs('engineer')
    const operator = await signedInAs('operator')
    const t = await releasedTestLot({ engineer, lead, stores }, 1)
    // The helper received its lot from "Test"; another spelling of a new name joins one record.
    const name = fresh()
    const first = (await receive(name, { partId: t.rev.bom[0]!.partId }).expect(201))
      .body as ComponentLotDto
    const second = (await receive(name.toLowerCase(), { partId: t.rev.bom[0]!.partId }).expect(201))
      .body as ComponentLotDto
    expect(second.supplierId).toBe(first.supplierId)
    const serial = t.units[0]!.serial
    await operator
      .post(
        '/api/step-runs',
        windingRun(t, serial, {
          consumptions: [{ bomLineId: t.rev.bom[0]!.id, code: second.internalCode }],
        }),
      )
      .expect(201)
    const recall = await lead.get(`/api/trace/component-lots/${second.internalCode}`).expect(200)
    expect(recall.body.componentLot.supplierName).toBe(name)
    const trace = await lead.get(`/api/trace/units/${serial}`)
    expect(trace.status).toBe(200)
    expect(JSON.stringify(trace.body)).toContain(`"supplierName":"${name}"`)
  })
})

describe('migration 20261205130700 (suppliers from the lots’ supplier texts)', () => {
  // Runs the migration's `up` in a scratch schema of the test database, on one connection, so
  // the lots it merges are exactly the ones below and the shared schema is untouched.
  const schema = `mig_suppliers_${uniqueSuffix().toLowerCase()}`
  let owner: Sequelize
  let scratch: Sequelize

  beforeAll(async () => {
    owner = ownerConnection()
    await owner.query(`CREATE SCHEMA ${schema}`)
    const config = owner.config
    scratch = new Sequelize(config.database, config.username, config.password ?? undefined, {
      host: config.host,
      port: Number(config.port),
      dialect: 'postgres',
      logging: false,
      pool: { max: 1, min: 1 },
    })
    await scratch.query(`SET search_path TO ${schema}`)
    await scratch.query(`
      CREATE TABLE component_lots (
        id uuid PRIMARY KEY,
        supplier_name varchar(120) NOT NULL,
        received_on date NOT NULL
      )`)
  })

  afterAll(async () => {
    await scratch?.close()
    await owner?.query(`DROP SCHEMA IF EXISTS ${schema} CASCADE`)
    await owner?.close()
  })

  it('makes one record per name whatever its case or spacing, and links every lot', async () => {
    const lots: [string, string][] = [
      ['Brindle Wire Co.', 'a'],
      ['brindle wire co.', 'b'],
      ['  Brindle   Wire Co. ', 'c'],
      ['Brindle Wire Co.', 'd'],
      ['Ostley Solder', 'e'],
      ['Ostley  Solders', 'f'],
    ]
    const ids = new Map<string, string>()
    for (const [name, key] of lots) {
      const id = randomUUID()
      ids.set(key, id)
      await scratch.query(
        `INSERT INTO component_lots (id, supplier_name, received_on) VALUES (:id, :name, '2026-11-01')`,
        { replacements: { id, name } },
      )
    }
    await up({ context: { sequelize: scratch } as unknown as MigrationContext })
    const [suppliers] = (await scratch.query('SELECT id, name FROM suppliers ORDER BY name')) as [
      { id: string; name: string }[],
      unknown,
    ]
    // The most used spelling names the record: "Brindle Wire Co." twice, once each otherwise.
    expect(suppliers.map((s) => s.name)).toEqual([
      'Brindle Wire Co.',
      'Ostley Solder',
      'Ostley Solders',
    ])
    const [linked] = (await scratch.query(
      'SELECT cl.id, s.name FROM component_lots cl JOIN suppliers s ON s.id = cl.supplier_id',
    )) as [{ id: string; name: string }[], unknown]
    const nameOf = (key: string) => linked.find((l) => l.id === ids.get(key))?.name
    expect(['a', 'b', 'c', 'd'].map(nameOf)).toEqual(Array(4).fill('Brindle Wire Co.'))
    expect([nameOf('e'), nameOf('f')]).toEqual(['Ostley Solder', 'Ostley Solders'])
    const [columns] = (await scratch.query(
      `SELECT column_name FROM information_schema.columns
        WHERE table_schema = :schema AND table_name = 'component_lots' ORDER BY column_name`,
      { replacements: { schema } },
    )) as [{ column_name: string }[], unknown]
    expect(columns.map((c) => c.column_name)).toEqual(['id', 'received_on', 'supplier_id'])
  })
})
