import { createHash } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { ImportDto, ImportRowDto } from '../../shared/schemas/imports'
import { db, ImportRow } from '../../server/models'
import {
  alertJobKey,
  alertsQueue,
  closeAlertsQueue,
} from '../../server/services/quality/alertQueue'
import { closeImportsQueue } from '../../server/services/imports/queue'
import {
  checkImport,
  failImport,
  pendingImports,
  processImport,
} from '../../server/services/imports'
import { LOT_ROLES, signedInRoles } from './support/client'
import type { TestClient } from './support/client'
import { loadTestRun, releasedTestLot, windingRun } from './support/floor'
import type { TestLot } from './support/floor'

const STATION = 'LDT-1'
const HEADER = 'Serial,Tested at,Operator,Vout (V),Comment'

async function stepRunCount(): Promise<number> {
  const [row] = await db().query<{ n: string }>('SELECT count(*) AS n FROM step_runs', {
    type: QueryTypes.SELECT,
  })
  return Number(row!.n)
}

async function stepRunsOf(serial: string): Promise<number> {
  const [row] = await db().query<{ n: string }>(
    'SELECT count(*) AS n FROM step_runs r JOIN units u ON u.id = r.unit_id WHERE u.serial = :serial',
    { replacements: { serial }, type: QueryTypes.SELECT },
  )
  return Number(row!.n)
}

/** A bench file: header plus one line per [serial, vout] pair; a unique comment varies the hash. */
function csv(rows: [string, string][], tag = String(Math.random())): Buffer {
  const lines = rows.map(([s, v], i) => `${s},2026-12-02 08:${10 + i}:00,jmarsh,${v},${tag}`)
  return Buffer.from([HEADER, ...lines].join('\r\n') + '\r\n')
}

describe('bench data import', () => {
  const { engineer, lead, stores, operator, service } = signedInRoles(...LOT_ROLES, 'service')
  let defectId: string

  const lot = (quantity: number) => releasedTestLot({ engineer, lead, stores }, quantity, 50)
  /** Winds the first `n` units of the lot, so they stand at Load test. */
  const wind = async (t: TestLot, n: number) => {
    for (const u of t.units.slice(0, n))
      await operator.post('/api/step-runs', windingRun(t, u.serial)).expect(201)
  }
  const upload = (client: TestClient, body: Buffer, name = 'rack.csv', station = STATION) =>
    client.post('/api/imports').field('stationCode', station).attach('file', body, name)
  const saveMapping = (client: TestClient = lead) =>
    client
      .send('put', `/api/stations/${STATION}/import-mapping`, {
        serialColumn: 'Serial',
        timeColumn: 'Tested at',
        operatorColumn: 'Operator',
        checkColumns: { vout: 'Vout (V)' },
      })
      .expect(200)
  const rowsOf = async (id: string): Promise<ImportRowDto[]> =>
    (await lead.get(`/api/imports/${id}/rows?pageSize=500`).expect(200)).body.rows
  const uploadAndCheck = async (body: Buffer): Promise<ImportDto> => {
    const up = await upload(lead, body).expect(201)
    const asked = await lead.post(`/api/imports/${up.body.id}/dry-run`).expect(202)
    expect(asked.body).toMatchObject({ status: 'checking', progress: 0 })
    await checkImport(up.body.id) // the job, run here rather than by a worker
    return (await lead.get(`/api/imports/${up.body.id}`).expect(200)).body
  }

  beforeAll(async () => {
    defectId = (await operator.get('/api/defect-codes')).body.find(
      (d: { code: string }) => d.code === 'L-VOUT',
    ).id
  }, 60_000) // five sign-ins hash five passwords: slow on a busy machine

  afterAll(async () => {
    await closeImportsQueue()
    await closeAlertsQueue()
  })

  it('takes a CSV up to 20 MB and refuses larger files (413) and non-text ones (415)', async () => {
    const t = await lot(1)
    const body = csv([[t.units[0]!.serial, '350.1']])
    const res = await upload(lead, body).expect(201)
    expect(res.body).toMatchObject({
      stationCode: STATION,
      filename: 'rack.csv',
      columns: ['Serial', 'Tested at', 'Operator', 'Vout (V)', 'Comment'],
      rowCount: 1,
      status: 'uploaded',
      sha256: createHash('sha256').update(body).digest('hex'),
    })
    // Just over 20 MB of otherwise valid CSV.
    const big = Buffer.concat([Buffer.from(`${HEADER}\n`), Buffer.alloc(20 * 1024 * 1024, 'x')])
    expect((await upload(lead, big, 'big.csv')).status).toBe(413)
    const png = Buffer.from('89504e470d0a1a0a0000000d4948445200000001000000010806000000', 'hex')
    const asPng = await upload(lead, png, 'renamed.csv')
    expect(asPng.status).toBe(415)
    expect(asPng.body.message).toMatch(/image\/png/)
    expect((await upload(lead, Buffer.from([0x53, 0x2c, 0x00, 0x01, 0x0a]), 'x.csv')).status).toBe(
      415,
    )
    expect((await upload(lead, Buffer.from([0xff, 0xfe, 0x41, 0x2c, 0x42]), 'x.csv')).status).toBe(
      415,
    )
    const none = await lead.post('/api/imports').field('stationCode', STATION)
    expect(none.status).toBe(400)
    expect(none.body.fields).toHaveProperty('file')
    const noStation = await lead.post('/api/imports').attach('file', body, 'rack.csv')
    expect(noStation.status).toBe(400)
    expect(noStation.body.fields).toHaveProperty('stationCode')
    expect((await upload(lead, Buffer.from('only one line\n'), 'x.csv')).status).toBe(400)
  })

  it('saves a station’s mapping once and offers it for the next file', async () => {
    const bad = await lead.send('put', `/api/stations/${STATION}/import-mapping`, {
      serialColumn: 'Serial',
      checkColumns: { no_such_check: 'X' },
    })
    expect(bad.status).toBe(400)
    expect(bad.body.fields).toHaveProperty('checkColumns.no_such_check')
    const saved = await saveMapping(engineer)
    expect(saved.body.saved).toMatchObject({
      serialColumn: 'Serial',
      timeColumn: 'Tested at',
      checkColumns: { vout: 'Vout (V)' },
    })
    expect(saved.body.checks.map((c: { key: string }) => c.key)).toContain('vout')
    const read = (await lead.get(`/api/stations/${STATION}/import-mapping`).expect(200)).body
    expect(read.saved.checkColumns).toEqual({ vout: 'Vout (V)' })
    const t = await lot(1)
    const next = await upload(lead, csv([[t.units[0]!.serial, '350']])).expect(201)
    expect(next.body.hasSavedMapping).toBe(true)
    expect(next.body.proposedMapping).toEqual({
      serialColumn: 'Serial',
      timeColumn: 'Tested at',
      operatorColumn: 'Operator',
      checkColumns: { vout: 'Vout (V)' },
    })
  })

  it('checks a file in a job that the sweeper finds again, runs once, and can fail without loss', async () => {
    await saveMapping()
    const t = await lot(2)
    await wind(t, 2)
    const up = await upload(lead, csv(t.units.map((u) => [u.serial, '350']))).expect(201)
    const id = up.body.id as string
    await lead.post(`/api/imports/${id}/dry-run`).expect(202)
    const twice = await lead.post(`/api/imports/${id}/dry-run`)
    expect(twice.status).toBe(409)
    expect(twice.body.message).toBe('this file is being checked; wait for the rows')
    const tooSoon = await lead.post(`/api/imports/${id}/run`, {})
    expect(tooSoon.status).toBe(409)
    expect(tooSoon.body.message).toBe('this file is being checked; wait for the rows')
    // A job lost while Redis was away: the sweeper sees the import still checking.
    const later = new Date(Date.now() + 60_000)
    expect((await pendingImports(later, 30_000)).filter((p) => p.id === id)).toEqual([
      expect.objectContaining({ id, kind: 'check' }),
    ])
    // Half the rows planned is 40 % (planning fills 80 % of the bar, storing the rest); what the
    // job reports, the screen reads at the same moment from the import.
    const seen: number[] = []
    const shown: number[] = []
    await checkImport(id, async (p) => {
      seen.push(p)
      if (p < 100) shown.push(((await lead.get(`/api/imports/${id}`)).body as ImportDto).progress)
    })
    expect(seen).toEqual([40, 80, 99, 100])
    expect(shown).toEqual([40, 80, 99])
    const checked = (await lead.get(`/api/imports/${id}`).expect(200)).body as ImportDto
    expect(checked).toMatchObject({ status: 'checked', counts: { ready: 2, errors: 0 } })
    // The transaction that wrote each row (xmin): a plan written again would show a new one.
    const rowIds = async () =>
      db().query<{ n: number; x: string }>(
        'SELECT row_number AS n, xmin::text AS x FROM import_rows WHERE import_id = :id ORDER BY 1',
        { replacements: { id }, type: QueryTypes.SELECT },
      )
    const first = await rowIds()
    await checkImport(id) // a second run of the same job changes nothing
    expect(await rowIds()).toEqual(first)
    // A check that cannot finish leaves the last good plan in place, with the reason.
    await lead.post(`/api/imports/${id}/dry-run`).expect(202)
    await failImport(id, 'the object store did not answer')
    expect((await lead.get(`/api/imports/${id}`).expect(200)).body).toMatchObject({
      status: 'checked',
      error: 'the object store did not answer',
    })
    expect(await rowIds()).toEqual(first)
  })

  it('dry-runs every row: what would be recorded and each kind of error, writing no step run', async () => {
    await saveMapping()
    const t = await lot(6)
    await wind(t, 5) // units 0–4 stand at Load test; unit 5 still waits for Winding
    const [a, b, c, d, e, f] = t.units.map((u) => u.serial)
    const mistyped = a!.slice(0, -1) + (a!.endsWith('A') ? 'B' : 'A')
    const body = csv([
      [a!, '350.2'], // row 2: good, passes (345–355 V)
      [b!, 'abc'], // row 3: not a number
      [c!, ''], // row 4: missing value
      [f!, '350'], // row 5: not at this station's step
      ['NOPE-123', '350'], // row 6: unknown serial
      [a!, '351'], // row 7: duplicate serial
      [mistyped, '350'], // row 8: mistyped serial
      [d!, '340.0'], // row 9: good, fails the lower limit
      [e!, ' 3.5e2 '], // row 10: good, exponent notation
    ])
    const before = await stepRunCount()
    const checked = await uploadAndCheck(body)
    expect(await stepRunCount()).toBe(before)
    expect(checked).toMatchObject({ status: 'checked', rowCount: 9 })
    expect(checked.counts).toMatchObject({ ready: 3, errors: 6, failing: 1 })
    const rows = await rowsOf(checked.id)
    const at = (n: number) => rows.find((r) => r.rowNumber === n)!
    expect(at(2)).toMatchObject({ serial: a, stepName: 'Load test', result: 'pass', errors: [] })
    expect(at(2).checks).toEqual([
      expect.objectContaining({ key: 'vout', cell: '350.2', value: 350.2, verdict: 'pass' }),
    ])
    expect(at(2)).toMatchObject({ benchTime: '2026-12-02 08:10:00', benchOperator: 'jmarsh' })
    expect(at(3).errors).toEqual(['Output: "abc" is not a number'])
    expect(at(4).errors).toEqual(['Output: no value in column "Vout (V)"'])
    expect(at(5).errors).toEqual([`${f} is waiting for Winding; this is Load-test rack 1`])
    expect(at(6).errors).toEqual(['no unit NOPE-123: check the traveler'])
    expect(at(7).errors).toEqual([
      `duplicate: ${a} is also on row 2; only one row per unit is imported from a file`,
    ])
    expect(at(8).errors[0]).toMatch(/is mistyped: its check character does not match/)
    // 340.0 V is under the 345 V lower limit of the recipe (limits inclusive; shared/recipes/evaluate.ts).
    expect(at(9)).toMatchObject({ result: 'fail', errors: [] })
    expect(at(9).checks[0]).toMatchObject({ value: 340, verdict: 'fail' })
    expect(at(10)).toMatchObject({ result: 'pass', errors: [] })
    expect(at(10).checks[0]!.value).toBe(350)
    const onlyErrors = (await lead.get(`/api/imports/${checked.id}/rows?show=errors`)).body
    expect(onlyErrors.total).toBe(6)
  })

  it('imports each good row exactly once: same file twice or a rerun job records nothing new', async () => {
    await saveMapping()
    const t = await lot(3)
    await wind(t, 3)
    const [a, b, c] = t.units.map((u) => u.serial)
    const body = csv([
      [a!, '350'],
      [b!, '341'],
      [c!, 'n/a'],
    ])
    const first = await uploadAndCheck(body)
    // Both checked before either runs: the second one's rows look good until the first records them.
    const twin = await uploadAndCheck(body)
    expect(twin.counts.ready).toBe(2)
    const noDefect = await lead.post(`/api/imports/${first.id}/run`, {})
    expect(noDefect.status).toBe(400)
    expect(noDefect.body.fields).toHaveProperty('defectCodeId')
    const before = await stepRunCount()
    const queued = await lead.post(`/api/imports/${first.id}/run`, { defectCodeId: defectId })
    expect(queued.status).toBe(202)
    expect(queued.body.status).toBe('queued')
    const seen: number[] = []
    await processImport(first.id, async (p) => void seen.push(p))
    expect(seen.at(-1)).toBe(100)
    expect(await stepRunCount()).toBe(before + 2)
    const done = (await lead.get(`/api/imports/${first.id}`)).body as ImportDto
    expect(done).toMatchObject({ status: 'done', progress: 100 })
    expect(done.counts).toMatchObject({ recorded: 2, skipped: 0, refused: 0 })
    const rows = await rowsOf(first.id)
    expect(rows.map((r) => r.outcome)).toEqual(['recorded', 'recorded', null])
    expect(rows[0]!.outcomeMessage).toBe(`pass (attempt 1); ${a} is now passed`)
    expect(rows[1]!.outcomeMessage).toBe(
      `fail (attempt 1); ${b} is now on hold; a nonconformance was opened`,
    )
    const note = await db().query<{ note: string; operator_id: string }>(
      `SELECT r.note FROM step_runs r JOIN units u ON u.id = r.unit_id WHERE u.serial = :a`,
      { replacements: { a }, type: QueryTypes.SELECT },
    )
    expect(note.map((n) => n.note)).toContain(
      'imported from rack.csv, row 2; bench time 2026-12-02 08:10:00; bench operator jmarsh',
    )
    // Running again is refused, and a rerun of the job finds every row already recorded.
    expect(
      (await lead.post(`/api/imports/${first.id}/run`, { defectCodeId: defectId })).status,
    ).toBe(409)
    await ImportRow.update(
      { outcome: null, outcomeMessage: null },
      { where: { importId: first.id } },
    )
    await db().query(`UPDATE imports SET status = 'running' WHERE id = :id`, {
      replacements: { id: first.id },
    })
    await processImport(first.id)
    expect(await stepRunCount()).toBe(before + 2)
    expect((await rowsOf(first.id)).map((r) => r.outcome)).toEqual(['repeat', 'repeat', null])
    // The twin, checked before the first ran, goes through the step-run recording: all repeats.
    await lead.post(`/api/imports/${twin.id}/run`, { defectCodeId: defectId }).expect(202)
    await processImport(twin.id)
    expect(await stepRunCount()).toBe(before + 2)
    const twinDone = (await lead.get(`/api/imports/${twin.id}`)).body as ImportDto
    expect(twinDone.counts).toMatchObject({ recorded: 0, skipped: 2 })
    // The same file uploaded a third time: the dry run already says so, and nothing can run.
    const third = await uploadAndCheck(body)
    expect(third.sameFileImports.map((s) => s.id)).toEqual(
      expect.arrayContaining([first.id, twin.id]),
    )
    expect(third.counts.ready).toBe(0)
    const thirdRows = await rowsOf(third.id)
    expect(thirdRows[0]!.errors).toContain(
      'already imported: this row of this file was recorded before',
    )
    expect((await lead.post(`/api/imports/${third.id}/run`, {})).status).toBe(409)
    expect(await stepRunCount()).toBe(before + 2)
    expect(await stepRunsOf(a!)).toBe(2) // winding + one load test
  })

  it('keeps the route-enforcement refusal of a row whose unit moved on after the dry run', async () => {
    await saveMapping()
    const t = await lot(2)
    await wind(t, 2)
    const [a, b] = t.units.map((u) => u.serial)
    const checked = await uploadAndCheck(
      csv([
        [a!, '350'],
        [b!, '349.5'],
      ]),
    )
    expect(checked.counts.ready).toBe(2)
    // Meanwhile someone records b's load test at the Floor.
    await operator.post('/api/step-runs', loadTestRun(b!, 350)).expect(201)
    await lead.post(`/api/imports/${checked.id}/run`, {}).expect(202)
    await processImport(checked.id)
    const rows = await rowsOf(checked.id)
    expect(rows[0]).toMatchObject({ outcome: 'recorded' })
    expect(rows[1]).toMatchObject({
      outcome: 'refused',
      outcomeMessage: `${b} has finished its route (passed); nothing more to record here`,
    })
    const done = (await lead.get(`/api/imports/${checked.id}`)).body as ImportDto
    expect(done.counts).toMatchObject({ recorded: 1, refused: 1 })
  })

  it('asks for the alert check of the lot step at once when it records a failing run', async () => {
    await saveMapping()
    const t = await lot(1)
    await wind(t, 1)
    const loadStep = t.rev.steps[1]!
    const key = alertJobKey(t.lot.id, loadStep.id)
    const checked = await uploadAndCheck(csv([[t.units[0]!.serial, '340']]))
    expect(checked.counts).toMatchObject({ ready: 1, failing: 1 })
    await lead.post(`/api/imports/${checked.id}/run`, { defectCodeId: defectId }).expect(202)
    // Nothing asked for the load-test step before the import records its run.
    expect(await alertsQueue().getDeduplicationJobId(key)).toBeFalsy()
    await processImport(checked.id)
    expect((await rowsOf(checked.id))[0]).toMatchObject({ outcome: 'recorded' })
    // The ask is not awaited by the recording (a scan never waits on Redis): poll for it.
    const deadline = Date.now() + 5000
    let jobId: string | null | undefined = null
    while (!jobId && Date.now() < deadline) {
      jobId = await alertsQueue().getDeduplicationJobId(key)
      if (!jobId) await new Promise((r) => setTimeout(r, 50))
    }
    expect(jobId).toBeTruthy()
    const job = await alertsQueue().getJob(jobId!)
    expect(job?.data).toEqual({ lotId: t.lot.id, stepId: loadStep.id })
  })

  it('refuses a run before the dry run, and refuses other roles', async () => {
    const t = await lot(1)
    const up = await upload(engineer, csv([[t.units[0]!.serial, '350']])).expect(201)
    for (const client of [operator, service, stores]) {
      expect((await upload(client, csv([[t.units[0]!.serial, '350']]))).status).toBe(403)
      expect((await client.post(`/api/imports/${up.body.id}/dry-run`)).status).toBe(403)
      expect((await client.post(`/api/imports/${up.body.id}/run`, {})).status).toBe(403)
      expect((await client.get(`/api/imports/${up.body.id}`)).status).toBe(403)
      expect(
        (
          await client.send('put', `/api/stations/${STATION}/import-mapping`, {
            serialColumn: 'Serial',
          })
        ).status,
      ).toBe(403)
    }
    const early = await lead.post(`/api/imports/${up.body.id}/run`, {})
    expect(early.status).toBe(409)
    expect(early.body.message).toBe('run the dry run first, then import')
  })
})
