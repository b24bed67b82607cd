import type { RevisionDto } from '../../../shared/schemas/recipes'
import type { TestClient } from './client'
import { uniqueSuffix } from './client'

/**
 * Builds, through the API, a small complete draft: one winding, a two-step route (winding with
 * an inductance check and its derived deviation; load test with one voltage check) and a part
 * fitted at the first step. Returns the revision as the API shows it.
 */
export async function buildSmallRecipe(engineer: TestClient): Promise<RevisionDto> {
  const code = `T${uniqueSuffix().slice(0, 5)}`
  const product = await engineer
    .post('/api/products', { code, name: `Test unit ${code}` })
    .expect(201)
  const revId: string = product.body.revisions[0].id
  const winding = await engineer
    .post(`/api/revisions/${revId}/windings`, {
      name: 'secondary',
      nominalTurns: 92,
      alNanoHenry: 3000,
    })
    .expect(201)
  const wind = await engineer
    .post(`/api/revisions/${revId}/steps`, { name: 'Winding', stationKind: 'winding' })
    .expect(201)
  const load = await engineer
    .post(`/api/revisions/${revId}/steps`, {
      name: 'Load test',
      stationKind: 'load_test',
      safetyNote: 'High voltage.',
    })
    .expect(201)
  await engineer
    .post(`/api/steps/${wind.body.id}/checks`, {
      key: 'l_sec',
      label: 'Inductance',
      kind: 'numeric',
      unit: 'mH',
      lower: 19,
      upper: 32,
    })
    .expect(201)
  await engineer
    .post(`/api/steps/${wind.body.id}/checks`, {
      key: 'sec_dev',
      label: 'Deviation',
      kind: 'numeric',
      unit: 'turns',
      lower: -12,
      upper: 12,
      derived: 'turn_deviation',
      derivedInputs: { inductance: 'l_sec', winding: winding.body.id },
    })
    .expect(201)
  await engineer
    .post(`/api/steps/${load.body.id}/checks`, {
      key: 'vout',
      label: 'Output',
      kind: 'numeric',
      unit: 'V',
      lower: 345,
      upper: 355,
    })
    .expect(201)
  const part = await engineer
    .post('/api/parts', {
      partNumber: `TP-${uniqueSuffix()}`,
      description: 'Test core',
      unitOfMeasure: 'set',
    })
    .expect(201)
  await engineer
    .post(`/api/revisions/${revId}/bom`, {
      partId: part.body.id,
      quantity: 1,
      fittedAtStepId: wind.body.id,
    })
    .expect(201)
  return (await engineer.get(`/api/revisions/${revId}`).expect(200)).body as RevisionDto
}
