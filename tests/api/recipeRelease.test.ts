import { QueryTypes } from 'sequelize'
import { describe, expect, it } from 'vitest'
import type { LotDto } from '../../shared/schemas/lots'
import type { ReleaseCheckDto } from '../../shared/recipes/releaseCheck'
import type { RevisionDto } from '../../shared/schemas/recipes'
import { db } from '../../server/models'
import { signedInRoles } from './support/client'
import { buildSmallRecipe } from './support/recipes'

async function auditRows(entityId: string, action: string) {
  return db().query<{ before: unknown; after: Record<string, unknown> }>(
    'SELECT before, after FROM audit_events WHERE entity_id = :entityId AND action = :action ORDER BY id',
    { replacements: { entityId, action }, type: QueryTypes.SELECT },
  )
}

describe('releasing a revision that replaces another', () => {
  const { engineer, lead } = signedInRoles('engineer', 'lead')

  /** Revision A released with a lot in progress on it, and a draft B copied from A. */
  async function replacedPair() {
    const a = await buildSmallRecipe(engineer)
    await engineer.post(`/api/revisions/${a.id}/release`).expect(200)
    const lot = (await lead.post('/api/lots', { revisionId: a.id, quantity: 2 }).expect(201))
      .body as LotDto
    await lead.post(`/api/lots/${lot.id}/release`).expect(200)
    const b = (await engineer.post(`/api/revisions/${a.id}/copy`).expect(201)).body as RevisionDto
    return { a, b, lot }
  }

  it('shows the change summary and the revision it replaces before release', async () => {
    const { a, b } = await replacedPair()
    expect(b.copiedFrom).toEqual({ id: a.id, letter: 'A' })
    const vout = b.steps[1]!.checks[0]!
    await engineer.patch(`/api/checks/${vout.id}`, { upper: 356 }).expect(200)
    await lead.post('/api/lots', { revisionId: a.id, quantity: 1 }).expect(201)

    const check = (await engineer.get(`/api/revisions/${b.id}/release-check`).expect(200))
      .body as ReleaseCheckDto
    expect(check.problems).toEqual([])
    expect(check.copiedFrom).toEqual({ id: a.id, letter: 'A' })
    expect(check.changes).toEqual([
      expect.objectContaining({
        area: 'limits',
        kind: 'changed',
        subject: 'check vout',
        detail: 'upper limit 355 V → 356 V',
        checkId: vout.id,
      }),
    ])
    expect(check.released).toEqual([{ id: a.id, letter: 'A', openLots: 1, plannedLots: 1 }])
  })

  it('makes the one before obsolete for new lots, keeps built lots on it, and audits both', async () => {
    const { a, b, lot } = await replacedPair()
    await engineer.patch(`/api/checks/${b.steps[1]!.checks[0]!.id}`, { lower: 340 }).expect(200)
    const released = await engineer.post(`/api/revisions/${b.id}/release`).expect(200)
    expect(released.body.status).toBe('released')
    expect((await engineer.get(`/api/revisions/${a.id}`)).body.status).toBe('obsolete')

    // Units already built keep revision A and its limits; only new lots move to B.
    const kept = (await lead.get(`/api/lots/${lot.id}`).expect(200)).body as LotDto
    expect(kept.status).toBe('released')
    expect(kept.revisionId).toBe(a.id)
    const refused = await lead.post('/api/lots', { revisionId: a.id, quantity: 1 }).expect(400)
    expect(refused.body.fields.revisionId).toMatch(/released revision/)
    await lead.post('/api/lots', { revisionId: b.id, quantity: 1 }).expect(201)

    const [release] = await auditRows(b.id, 'revision.release')
    expect(release!.after).toMatchObject({
      status: 'released',
      copiedFrom: 'A',
      obsoleted: ['A'],
      keptReleased: [],
      changes: [{ area: 'limits', kind: 'changed', text: 'check vout: lower limit 345 V → 340 V' }],
    })
    const [retired] = await auditRows(a.id, 'revision.obsolete')
    expect(retired!.after).toMatchObject({ status: 'obsolete', replacedBy: 'B', openLots: 1 })
  })

  it('keeps the one before released when asked, and names a bad choice', async () => {
    const { a, b } = await replacedPair()
    const bad = await engineer.post(`/api/revisions/${b.id}/release`, { previous: 'retire' })
    expect(bad.status).toBe(400)
    expect(bad.body.fields.previous).toBeDefined()
    expect((await engineer.get(`/api/revisions/${b.id}`)).body.status).toBe('draft')

    await engineer.post(`/api/revisions/${b.id}/release`, { previous: 'keep' }).expect(200)
    expect((await engineer.get(`/api/revisions/${a.id}`)).body.status).toBe('released')
    const [release] = await auditRows(b.id, 'revision.release')
    expect(release!.after).toMatchObject({ obsoleted: [], keptReleased: ['A'], changes: [] })
  })

  it('refuses release to a lead, leaving the draft as it was', async () => {
    const { b } = await replacedPair()
    expect((await lead.post(`/api/revisions/${b.id}/release`)).status).toBe(403)
    expect((await engineer.get(`/api/revisions/${b.id}`)).body.status).toBe('draft')
  })
})

describe('a revision’s working voltage', () => {
  const { engineer } = signedInRoles('engineer')

  it('is saved on a draft, copied into the next revision, and refused when not positive', async () => {
    const rev = await buildSmallRecipe(engineer)
    expect(rev).toMatchObject({ workingVolts: null, insulation: 'basic', copiedFrom: null })
    const bad = await engineer.patch(`/api/revisions/${rev.id}`, { workingVolts: -5 }).expect(400)
    expect(bad.body.fields.workingVolts).toMatch(/more than 0 V/)
    const badClass = await engineer
      .patch(`/api/revisions/${rev.id}`, { insulation: 'double' })
      .expect(400)
    expect(badClass.body.fields.insulation).toMatch(/basic or reinforced/)
    const saved = await engineer
      .patch(`/api/revisions/${rev.id}`, { workingVolts: 350, insulation: 'reinforced' })
      .expect(200)
    expect(saved.body).toMatchObject({ workingVolts: 350, insulation: 'reinforced' })
    await engineer.post(`/api/revisions/${rev.id}/release`).expect(200)
    const copy = (await engineer.post(`/api/revisions/${rev.id}/copy`).expect(201)).body
    expect(copy).toMatchObject({ workingVolts: 350, insulation: 'reinforced' })
    const [audit] = await auditRows(rev.id, 'revision.update')
    expect(audit!.after).toMatchObject({ workingVolts: 350, insulation: 'reinforced' })
  })
})
