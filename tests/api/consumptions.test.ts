import { randomUUID } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import { describe, expect, it } from 'vitest'
import { db } from '../../server/models'
import { LOT_ROLES, signedInRoles, uniqueSuffix } from './support/client'

describe('serial-traced parts', () => {
  const { engineer, lead, stores, operator } = signedInRoles(...LOT_ROLES)

  /** A released one-step recipe fitting one serial-traced board, and a released lot of it. */
  async function serialTracedLot(quantity: number) {
    const product = await engineer
      .post('/api/products', { code: `S${uniqueSuffix().slice(0, 5)}`, name: 'Serial test' })
      .expect(201)
    const revId: string = product.body.revisions[0].id
    const step = await engineer
      .post(`/api/revisions/${revId}/steps`, { name: 'Soldering', stationKind: 'soldering' })
      .expect(201)
    await engineer
      .post(`/api/steps/${step.body.id}/checks`, {
        key: 'joints_ok',
        label: 'Joints inspected',
        kind: 'boolean',
      })
      .expect(201)
    const part = await engineer
      .post('/api/parts', { partNumber: `PCB-${uniqueSuffix()}`, description: 'Main board' })
      .expect(201)
    const line = await engineer
      .post(`/api/revisions/${revId}/bom`, {
        partId: part.body.id,
        quantity: 1,
        fittedAtStepId: step.body.id,
        traceLevel: 'serial',
      })
      .expect(201)
    await engineer.post(`/api/revisions/${revId}/release`).expect(200)
    const lot = await lead.post('/api/lots', { revisionId: revId, quantity }).expect(201)
    await lead.post(`/api/lots/${lot.body.id}/release`).expect(200)
    const serials: string[] = (await lead.get(`/api/lots/${lot.body.id}/units`)).body.map(
      (u: { serial: string }) => u.serial,
    )
    const receive = async () =>
      (
        await stores
          .post('/api/component-lots', {
            partId: part.body.id,
            supplierName: 'Boards Ltd',
            supplierLotCode: `B-${uniqueSuffix()}`,
            quantityReceived: 20,
            receivedOn: '2026-11-20',
          })
          .expect(201)
      ).body as { id: string; internalCode: string }
    const run = (serial: string, boards: { internalCode: string }, itemSerial?: string) => ({
      clientEventId: randomUUID(),
      serial,
      stationCode: 'SLD-1',
      values: { joints_ok: true },
      consumptions: [{ bomLineId: line.body.id, code: boards.internalCode, itemSerial }],
    })
    return { partId: part.body.id as string, lineId: line.body.id as string, serials, receive, run }
  }

  it('needs one distinct item serial per unit on a serial-traced line', async () => {
    const { lineId, serials, receive, run: runOf } = await serialTracedLot(2)
    const [a, b] = serials as [string, string]
    const boards = await receive()
    const run = (serial: string, itemSerial?: string) => runOf(serial, boards, itemSerial)
    const missing = await operator.post('/api/step-runs', run(a))
    expect(missing.status).toBe(400)
    expect(missing.body.fields[`consumptions.${lineId}`]).toBe('scan the item’s serial')
    await operator.post('/api/step-runs', run(a, 'mb-0001')).expect(201)
    const reused = await operator.post('/api/step-runs', run(b, 'MB-0001'))
    expect(reused.status).toBe(409)
    expect(reused.body.message).toMatch(new RegExp(`serial MB-0001 is already fitted to unit ${a}`))
    await operator.post('/api/step-runs', run(b, 'MB-0002')).expect(201)
    const stock = (await stores.get(`/api/component-lots/${boards.id}`)).body
    expect(stock.quantityRemaining).toBe(18)
  })

  it('fits a part serial to one unit only, whichever lot of the part it is scanned from', async () => {
    const rounds = 5
    const { partId, lineId, serials, receive, run } = await serialTracedLot(1 + 2 * rounds)
    const [first, ...pairs] = serials as [string, ...string[]]
    const [boards1, boards2] = [await receive(), await receive()]
    const field = `consumptions.${lineId}`
    await operator.post('/api/step-runs', run(first, boards1, 'MB-1000')).expect(201)
    const again = await operator.post('/api/step-runs', run(pairs[0]!, boards2, 'mb-1000'))
    expect(again.status).toBe(409)
    expect(again.body).toMatchObject({
      error: 'item_serial_used',
      fields: { [field]: `already fitted to unit ${first}` },
    })
    // Two stations scan one board serial at once, from two lots: exactly one wins each time.
    for (let i = 0; i < rounds; i++) {
      const [x, y] = [pairs[2 * i]!, pairs[2 * i + 1]!]
      const itemSerial = `MB-20${i}`
      const answers = await Promise.all([
        operator.post('/api/step-runs', run(x, boards1, itemSerial)),
        operator.post('/api/step-runs', run(y, boards2, itemSerial)),
      ])
      const statuses = answers.map((r) => r.status).sort()
      expect(statuses, JSON.stringify(answers.map((r) => r.body))).toEqual([201, 409])
      const winner = answers[0]!.status === 201 ? x : y
      const loser = answers.find((r) => r.status === 409)!
      expect(loser.body.error).toBe('item_serial_used')
      expect(loser.body.fields[field]).toBe(`already fitted to unit ${winner}`)
      const held = await db().query<{ serial: string }>(
        `SELECT u.serial FROM consumptions c JOIN units u ON u.id = c.unit_id
          WHERE c.part_id = :partId AND c.item_serial = :itemSerial`,
        { replacements: { partId, itemSerial }, type: QueryTypes.SELECT },
      )
      expect(held).toEqual([{ serial: winner }])
    }
    // The database holds the rule too, for writers other than the scan.
    const [one] = await db().query<Record<string, string>>(
      `SELECT unit_id, bom_line_id, step_run_id FROM consumptions
        WHERE part_id = :partId AND item_serial = 'MB-1000'`,
      { replacements: { partId }, type: QueryTypes.SELECT },
    )
    const twice = db().query(
      `INSERT INTO consumptions (id, unit_id, component_lot_id, part_id, bom_line_id, step_run_id,
                                 quantity, item_serial, created_at)
       VALUES (gen_random_uuid(), :unitId, :lotId, :partId, :lineId, :runId, 1, 'MB-1000', now())`,
      {
        replacements: {
          unitId: one!.unit_id,
          lotId: boards2.id,
          partId,
          lineId: one!.bom_line_id,
          runId: one!.step_run_id,
        },
      },
    )
    await expect(twice).rejects.toMatchObject({
      parent: { code: '23505', constraint: 'consumptions_part_serial_key' },
    })
  })
})
