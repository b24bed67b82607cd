import { LOT_QUANTITY_MAX } from '../../shared/lots'
import { SEED_ACTOR } from '../../server/seed/demo'
import { User } from '../../server/models'
import { createCheck } from '../../server/services/recipes'
import { listLotUnits } from '../../server/services/lots'
import { createLot, releaseLot } from '../../server/services/lots'
import { createProduct } from '../../server/services/recipes'
import { releaseRevision } from '../../server/services/recipes'
import { createStep } from '../../server/services/recipes'

/**
 * A one-step winding recipe with two checks, released, and released lots of it holding `units`
 * in all (a lot holds at most 2000). Returns the serials, queued at the winding step. The product
 * code must be new to the database.
 */
export async function seedBenchLot(units: number, productCode = 'BN01'): Promise<string[]> {
  const product = await createProduct(
    { code: productCode, name: 'Benchmark unit', description: 'made by scripts/bench' },
    SEED_ACTOR,
  )
  const revId = product.revisions[0]!.id
  const step = await createStep(
    revId,
    {
      name: 'Winding',
      stationKind: 'winding',
      instructions: '',
      safetyNote: '',
      requiresSignoff: false,
    },
    SEED_ACTOR,
  )
  const base = {
    nominal: null,
    decimals: 2,
    choices: null,
    derived: null,
    derivedInputs: null,
  } as const
  await createCheck(
    step.id,
    { ...base, key: 'turns', label: 'Turns', kind: 'numeric', unit: 'turns', lower: 92, upper: 92 },
    SEED_ACTOR,
  )
  await createCheck(
    step.id,
    {
      ...base,
      key: 'l_sec',
      label: 'Inductance',
      kind: 'numeric',
      unit: 'mH',
      lower: 19,
      upper: 32,
    },
    SEED_ACTOR,
  )
  // A second step so a recorded unit moves on rather than finishing its route.
  await createStep(
    revId,
    {
      name: 'Inspect',
      stationKind: 'inspection',
      instructions: '',
      safetyNote: '',
      requiresSignoff: false,
    },
    SEED_ACTOR,
  )
  await releaseRevision(revId, SEED_ACTOR)
  const lead = (await User.findOne({ where: { role: 'lead' } }))!
  const actor = { ...SEED_ACTOR, id: lead.id, email: lead.email }
  const serials: string[] = []
  for (let left = units; left > 0; left -= LOT_QUANTITY_MAX) {
    const quantity = Math.min(left, LOT_QUANTITY_MAX)
    const lot = await createLot(
      { revisionId: revId, quantity, orderRef: 'BENCH', customerName: '', dueDate: null },
      actor,
    )
    await releaseLot(lot.id, actor)
    serials.push(...(await listLotUnits(lot.id)).map((u) => u.serial))
  }
  return serials
}
