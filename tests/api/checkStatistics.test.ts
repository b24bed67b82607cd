import { mkdir, writeFile } from 'node:fs/promises'
import { beforeAll, describe, expect, it } from 'vitest'
import type { DocumentDto } from '../../shared/schemas/lots'
import type { RevisionDto } from '../../shared/schemas/recipes'
import type { StatisticsDto } from '../../shared/schemas/statistics'
import { AuditEvent } from '../../server/models'
import { renderDocument } from '../../server/services/documents/documentRender'
import { LOT_ROLES, signedInRoles } from './support/client'
import { binary, pdfText } from './support/pdf'
import { loadTestRun, releasedTestLot, windingRun } from './support/floor'
import type { TestLot } from './support/floor'

// Statistics on any numeric check, the two document flags of a check, and what the lot report
// and the customer's certificate print because of them (issue 20 points 4 and 6).

const today = new Date().toISOString().slice(0, 10)
// The output voltages of eight units, in scan order (invented for the test).
const VOUT = [350, 351, 349, 350, 352, 348, 350, 351]

describe('statistics on any check and the document flags', () => {
  const { engineer, lead, stores, operator, service } = signedInRoles(...LOT_ROLES, 'service')
  let t: TestLot
  let rev: RevisionDto
  const checkId = (key: string) => rev.steps.flatMap((s) => s.checks).find((c) => c.key === key)!

  async function documentText(made: { body: unknown }): Promise<string> {
    const doc = made.body as DocumentDto
    await renderDocument(doc.id, async () => {})
    const file = await binary(lead.get(`/api/documents/${doc.id}/file`)).expect(200)
    await mkdir('test-results', { recursive: true })
    await writeFile(`test-results/stats-${doc.kind}.pdf`, file.body as Buffer) // to look at
    return pdfText(file.body as Buffer)
  }

  beforeAll(async () => {
    t = await releasedTestLot({ engineer, lead, stores }, VOUT.length)
    for (const [i, u] of t.units.entries()) {
      await operator.post('/api/step-runs', windingRun(t, u.serial)).expect(201)
      await operator.post('/api/step-runs', loadTestRun(u.serial, VOUT[i]!)).expect(201)
    }
    rev = (await engineer.get(`/api/revisions/${t.rev.id}`).expect(200)).body as RevisionDto
  }, 120_000)

  it('starts turn counts off the certificate and every check off the lot report', () => {
    expect(checkId('sec_dev')).toMatchObject({ isForCustomers: false, isKey: false })
    expect(checkId('l_sec')).toMatchObject({ isForCustomers: true, isKey: false })
    expect(checkId('vout')).toMatchObject({ isForCustomers: true, isKey: false })
  })

  it('lists the lot’s numeric checks with their readings, in route order', async () => {
    const res = await lead.get(`/api/yield/lots/${t.lot.id}/statistics`).expect(200)
    const body = res.body as StatisticsDto
    expect(body.selected).toBeNull()
    expect(body.checks.map((c) => [c.key, c.readings])).toEqual([
      ['l_sec', 8],
      ['sec_dev', 8],
      ['vout', 8],
    ])
  })

  it('gives a check’s series in scan order with I-MR limits and Cp/Cpk intervals', async () => {
    const res = await lead
      .get(`/api/yield/lots/${t.lot.id}/statistics?checkId=${checkId('vout').id}`)
      .expect(200)
    const s = (res.body as StatisticsDto).selected!
    expect(s.points.map((p) => p.value)).toEqual(VOUT)
    expect(s.points.map((p) => p.serial)).toEqual(t.units.map((u) => u.serial))
    expect(s.check).toMatchObject({ key: 'vout', lower: 345, upper: 355, unit: 'V' })
    const st = s.statistics
    expect(st.judgement).toBe('judged')
    // Computed by hand: mean 2801/8 = 350.125; moving ranges 1,2,1,2,4,2,1 → MR̄ 13/7 =
    // 1.857143, σ = MR̄/1.128 = 1.646403 (d2 for n = 2, Montgomery §6.4); UCL 355.064210,
    // LCL 345.185790, MR UCL 3.267·MR̄ = 6.067286.
    expect(st.chart!.center).toBeCloseTo(350.125, 6)
    expect(st.chart!.ucl).toBeCloseTo(355.06421, 5)
    expect(st.chart!.lcl).toBeCloseTo(345.18579, 5)
    expect(st.chart!.mrUcl).toBeCloseTo(6.067286, 5)
    expect(st.violations).toEqual([])
    // Cp = 10/(6σ) = 1.012308; Cpk = 4.875/(3σ) = 0.987 (common practice formulas, by hand);
    // Bissell (1990) 95 %: 0.987 ± 1.959964·√(1/72 + 0.987²/14) = 0.420735 – 1.553265.
    expect(st.capability.cp).toBeCloseTo(1.012308, 5)
    expect(st.capability.cpk).toBeCloseTo(0.987, 5)
    expect(st.cpkInterval!.low).toBeCloseTo(0.420735, 4)
    expect(st.cpkInterval!.high).toBeCloseTo(1.553265, 4)
    expect(st.cpInterval!.low).toBeLessThan(1.012308)
  })

  it('says not enough variation to judge for a series without spread', async () => {
    const res = await lead
      .get(`/api/yield/lots/${t.lot.id}/statistics?checkId=${checkId('l_sec').id}`)
      .expect(200)
    const st = (res.body as StatisticsDto).selected!.statistics
    expect(st.judgement).toBe('no_spread')
    expect(st.judgementText).toBe('not enough variation to judge')
    expect(st.chart).toBeNull()
    expect(st.capability.cpk).toBeNull()
  })

  it('refuses a check that is not a numeric check of the lot, naming the field', async () => {
    const res = await lead
      .get(`/api/yield/lots/${t.lot.id}/statistics?checkId=${t.lot.id}`)
      .expect(400)
    expect(res.body.message).toMatch(/^checkId:/)
    await lead.get(`/api/yield/lots/${t.lot.id}/statistics?checkId=nope`).expect(400)
  })

  it('gives a product’s check across lots in a period on the Yield board', async () => {
    const q = `productId=${rev.productId}&from=${today}&to=${today}`
    const list = (await lead.get(`/api/yield/statistics?${q}`).expect(200)).body as StatisticsDto
    expect(list.checks.find((c) => c.key === 'vout')).toMatchObject({ ref: 'vout', readings: 8 })
    const one = (await lead.get(`/api/yield/statistics?${q}&checkKey=vout`).expect(200))
      .body as StatisticsDto
    expect(one.selected!.points.map((p) => p.value)).toEqual(VOUT)
    expect(one.selected!.limitsFrom).toBe(rev.letter)
    const bad = await lead
      .get(`/api/yield/statistics?productId=${rev.productId}&from=${today}&to=2000-01-01`)
      .expect(400)
    expect(bad.body.message).toMatch(/^to:/)
  })

  it('lets the document flags change on a released revision, audited, and nothing else', async () => {
    const vout = checkId('vout')
    const res = await engineer.patch(`/api/checks/${vout.id}`, { isKey: true }).expect(200)
    expect(res.body.isKey).toBe(true)
    const audit = await AuditEvent.findOne({
      where: { action: 'check.update', entityId: vout.id },
    })
    expect(audit?.after).toMatchObject({ isKey: true })
    const frozen = await engineer.patch(`/api/checks/${vout.id}`, { isKey: true, upper: 360 })
    expect(frozen.status).toBe(409)
    await lead.patch(`/api/checks/${vout.id}`, { isKey: false }).expect(403)
  })

  it('prints a section per key check in the lot report', async () => {
    const made = await lead
      .post(`/api/lots/${t.lot.id}/documents`, { kind: 'lot_report' })
      .expect(201)
    const text = await documentText(made)
    expect(text).toContain('Key check · Load test · Output (V)')
    expect(text).toMatch(/Cpk 0\.99 \(95 % 0\.42 – 1\.55\)/)
    expect(text).not.toContain('Key check · Winding')
  })

  it('certifies each test against its limits, turn counts only when marked for customers', async () => {
    const serial = t.units[0]!.serial
    const before = await documentText(
      await service.post(`/api/units/${serial}/certificate`).expect(201),
    )
    expect(before).toMatch(/Output 345–355 V 350 V PASS/)
    expect(before).toContain('Inductance')
    expect(before).not.toContain('Deviation')
    await engineer
      .patch(`/api/checks/${checkId('sec_dev').id}`, { isForCustomers: true })
      .expect(200)
    const after = await documentText(
      await service.post(`/api/units/${serial}/certificate`).expect(201),
    )
    expect(after).toContain('Deviation (derived)')
  })
})
