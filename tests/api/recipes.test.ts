import { describe, expect, it } from 'vitest'
import type { RevisionDto } from '../../shared/schemas/recipes'
import { signedInAs, signedInRoles, uniqueSuffix } from './support/client'
import { buildSmallRecipe } from './support/recipes'

describe('recipes', () => {
  const { engineer } = signedInRoles('engineer')

  it('lists products with their revisions in the documented shape', async () => {
    const operator = await signedInAs('operator')
    const res = await operator.get('/api/products').expect(200)
    const fp24 = res.body.find((p: { code: string }) => p.code === 'FP24')
    expect(Object.keys(fp24).sort()).toEqual(['code', 'description', 'id', 'name', 'revisions'])
    expect(
      fp24.revisions.map((r: { letter: string; status: string }) => `${r.letter}:${r.status}`),
    ).toEqual(expect.arrayContaining(['A:obsolete', 'B:released']))
    const b = fp24.revisions.find((r: { letter: string }) => r.letter === 'B')
    const rev = await operator.get(`/api/revisions/${b.id}`).expect(200)
    expect(rev.body.steps.map((s: { name: string }) => s.name)).toEqual([
      'Winding',
      'Soldering',
      'Hipot',
      'Load test',
      'Final inspection',
      'Packing',
    ])
    expect(Object.keys(rev.body.steps[0].checks[0]).sort()).toEqual(
      expect.arrayContaining([
        'id',
        'key',
        'label',
        'kind',
        'unit',
        'nominal',
        'lower',
        'upper',
        'derived',
      ]),
    )
  })

  it('names what is missing before release and releases once complete', async () => {
    const product = await engineer
      .post('/api/products', { code: `R${uniqueSuffix().slice(0, 5)}`, name: 'Empty' })
      .expect(201)
    const revId = product.body.revisions[0].id
    const refused = await engineer.post(`/api/revisions/${revId}/release`)
    expect(refused.status).toBe(409)
    expect(refused.body.error).toBe('revision_incomplete')
    expect(refused.body.details).toEqual(['the route has no steps'])
    const step = await engineer
      .post(`/api/revisions/${revId}/steps`, { name: 'Inspect', stationKind: 'inspection' })
      .expect(201)
    await engineer
      .post(`/api/steps/${step.body.id}/checks`, { key: 'v', label: 'Volts', kind: 'numeric' })
      .expect(201)
    const check = await engineer.get(`/api/revisions/${revId}/release-check`).expect(200)
    expect(check.body.problems).toEqual([
      'step 1 "Inspect", check v: choose a unit',
      'step 1 "Inspect", check v: give at least one limit',
    ])
    const rev = await engineer.get(`/api/revisions/${revId}`)
    await engineer
      .patch(`/api/checks/${rev.body.steps[0].checks[0].id}`, { unit: 'V', lower: 1 })
      .expect(200)
    const released = await engineer.post(`/api/revisions/${revId}/release`).expect(200)
    expect(released.body.status).toBe('released')
    expect(released.body.releasedAt).not.toBeNull()
    expect(released.body.releasedBy).toBe('Imogen Tarrant')
  })

  it('refuses every change to a released revision with 409 and leaves it as it was', async () => {
    const rev = await buildSmallRecipe(engineer)
    await engineer.post(`/api/revisions/${rev.id}/release`).expect(200)
    const before = (await engineer.get(`/api/revisions/${rev.id}`)).body as RevisionDto
    const [wind, load] = before.steps
    const attempts: [string, string, object?][] = [
      ['patch', `/api/revisions/${rev.id}`, { notes: 'x' }],
      ['delete', `/api/revisions/${rev.id}`],
      ['post', `/api/revisions/${rev.id}/release`],
      [
        'post',
        `/api/revisions/${rev.id}/windings`,
        { name: 'extra', nominalTurns: 3, alNanoHenry: 100 },
      ],
      ['post', `/api/revisions/${rev.id}/steps`, { name: 'Extra', stationKind: 'other' }],
      ['put', `/api/revisions/${rev.id}/steps/order`, { stepIds: [load!.id, wind!.id] }],
      ['post', `/api/revisions/${rev.id}/bom`, { partId: before.bom[0]!.partId, quantity: 2 }],
      ['patch', `/api/steps/${wind!.id}`, { name: 'Renamed' }],
      ['delete', `/api/steps/${load!.id}`],
      ['post', `/api/steps/${wind!.id}/checks`, { key: 'new_one', label: 'New', kind: 'boolean' }],
      ['patch', `/api/checks/${wind!.checks[0]!.id}`, { upper: 99 }],
      ['delete', `/api/checks/${wind!.checks[0]!.id}`],
      ['patch', `/api/windings/${before.windings[0]!.id}`, { nominalTurns: 90 }],
      ['delete', `/api/windings/${before.windings[0]!.id}`],
      ['patch', `/api/bom-lines/${before.bom[0]!.id}`, { quantity: 3 }],
      ['delete', `/api/bom-lines/${before.bom[0]!.id}`],
    ]
    for (const [method, path, body] of attempts) {
      const res = await engineer.send(method as 'post', path, body)
      expect({ method, path, status: res.status, error: res.body.error }).toEqual({
        method,
        path,
        status: 409,
        error: 'revision_frozen',
      })
      expect(res.body.message).toMatch(/new revision/)
    }
    expect((await engineer.get(`/api/revisions/${rev.id}`)).body).toEqual(before)
  })

  it('copies a revision deeply into a draft with the next letter, leaving the old one untouched', async () => {
    const rev = await buildSmallRecipe(engineer)
    await engineer.post(`/api/revisions/${rev.id}/release`).expect(200)
    const before = (await engineer.get(`/api/revisions/${rev.id}`)).body as RevisionDto
    const copy = (await engineer.post(`/api/revisions/${rev.id}/copy`).expect(201))
      .body as RevisionDto
    expect(copy.letter).toBe('B')
    expect(copy.status).toBe('draft')
    expect(copy.steps.map((s) => s.name)).toEqual(before.steps.map((s) => s.name))
    expect(copy.steps.flatMap((s) => s.checks.map((c) => c.key))).toEqual(
      before.steps.flatMap((s) => s.checks.map((c) => c.key)),
    )
    const oldIds = new Set([
      ...before.steps.map((s) => s.id),
      ...before.windings.map((w) => w.id),
      ...before.bom.map((b) => b.id),
    ])
    for (const id of [
      ...copy.steps.map((s) => s.id),
      ...copy.windings.map((w) => w.id),
      ...copy.bom.map((b) => b.id),
    ])
      expect(oldIds.has(id)).toBe(false)
    const derived = copy.steps[0]!.checks.find((c) => c.derived)!
    expect(derived.derivedInputs!.winding).toBe(copy.windings[0]!.id)
    expect(copy.bom[0]!.fittedAtStepId).toBe(copy.steps[0]!.id)
    await engineer
      .patch(`/api/steps/${copy.steps[0]!.id}`, { name: 'Winding, new way' })
      .expect(200)
    expect((await engineer.get(`/api/revisions/${rev.id}`)).body).toEqual(before)
  })

  it('validates check limits on create and on update, naming the field', async () => {
    const rev = await buildSmallRecipe(engineer)
    const stepId = rev.steps[1]!.id
    const bad = await engineer.post(`/api/steps/${stepId}/checks`, {
      key: 'iout',
      label: 'Current',
      kind: 'numeric',
      unit: 'A',
      lower: 2,
      upper: 1,
    })
    expect(bad.status).toBe(400)
    expect(bad.body.fields.lower).toMatch(/lower limit/)
    const vout = rev.steps[1]!.checks[0]!
    const badPatch = await engineer.patch(`/api/checks/${vout.id}`, { lower: 400 })
    expect(badPatch.status).toBe(400)
    expect(badPatch.body.fields).toHaveProperty('lower')
    const dup = await engineer.post(`/api/steps/${stepId}/checks`, {
      key: 'l_sec',
      label: 'Again',
      kind: 'boolean',
    })
    expect(dup.status).toBe(409)
    expect(dup.body.fields).toEqual({ key: 'already used in this revision' })
    const unit = await engineer.post(`/api/steps/${stepId}/checks`, {
      key: 'x1',
      label: 'X',
      kind: 'numeric',
      unit: 'furlong',
    })
    expect(unit.status).toBe(400)
    expect(unit.body.fields).toHaveProperty('unit')
  })

  it('keeps step positions unique and dense through moves, reorders and deletes', async () => {
    const rev = await buildSmallRecipe(engineer)
    const third = await engineer
      .post(`/api/revisions/${rev.id}/steps`, { name: 'Pack', stationKind: 'packing' })
      .expect(201)
    expect(third.body.position).toBe(3)
    await engineer.patch(`/api/steps/${third.body.id}`, { position: 1 }).expect(200)
    const names = async () =>
      ((await engineer.get(`/api/revisions/${rev.id}`)).body as RevisionDto).steps.map(
        (s) => `${s.position}:${s.name}`,
      )
    expect(await names()).toEqual(['1:Pack', '2:Winding', '3:Load test'])
    const ids = ((await engineer.get(`/api/revisions/${rev.id}`)).body as RevisionDto).steps.map(
      (s) => s.id,
    )
    await engineer
      .send('put', `/api/revisions/${rev.id}/steps/order`, { stepIds: [ids[1], ids[2], ids[0]] })
      .expect(200)
    expect(await names()).toEqual(['1:Winding', '2:Load test', '3:Pack'])
    const partial = await engineer.send('put', `/api/revisions/${rev.id}/steps/order`, {
      stepIds: [ids[0]],
    })
    expect(partial.status).toBe(400)
    await engineer.send('delete', `/api/steps/${ids[1]}`).expect(204)
    expect(await names()).toEqual(['1:Load test', '2:Pack'])
  })

  it('refuses a recipe change from a role that may only read it', async () => {
    const rev = await buildSmallRecipe(engineer)
    const lead = await signedInAs('lead')
    expect((await lead.patch(`/api/steps/${rev.steps[0]!.id}`, { name: 'x' })).status).toBe(403)
    expect((await lead.get(`/api/revisions/${rev.id}/release-check`)).status).toBe(200)
  })
})
