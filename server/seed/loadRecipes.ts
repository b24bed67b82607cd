import { ComponentLot, DefectCode, Part, Product } from '../models'
import type { Actor } from '../services/admin'
import { createBomLine } from '../services/recipes'
import { createCheck } from '../services/recipes'
import { receiveComponentLot, setComponentLotStatus } from '../services/receiving'
import { createDefectCode } from '../services/recipes'
import { createPart } from '../services/recipes'
import { createProduct } from '../services/recipes'
import {
  copyRevision,
  createRevision,
  obsoleteRevision,
  releaseRevision,
} from '../services/recipes'
import { createStep } from '../services/recipes'
import { createWinding } from '../services/recipes'
import { CheckInput } from '../../shared/schemas/recipes'
import { DEMO_PRODUCTS } from './demoProducts'
import type { DemoRevision } from './demoRecipes'
import { DEMO_PARTS } from './demoRecipes'
import { DEMO_COMPONENT_LOTS, DEMO_DEFECT_CODES } from './demoReceiving'
import { daysBefore } from './demoClock'

/** Fills a draft revision from demo data through the same services the API uses. */
async function fillRevision(
  revisionId: string,
  data: DemoRevision,
  partIds: Map<string, string>,
  actor: Actor,
) {
  const windingIds = new Map<string, string>()
  for (const w of data.windings)
    windingIds.set(w.name, (await createWinding(revisionId, w, actor)).id)
  const stepIds = new Map<string, string>()
  for (const { checks, ...step } of data.steps) {
    const created = await createStep(revisionId, step, actor)
    stepIds.set(step.name, created.id)
    for (const c of checks) {
      const inputs =
        c.derivedInputs &&
        Object.fromEntries(
          Object.entries(c.derivedInputs).map(([k, v]) => [k, windingIds.get(v) ?? v]),
        )
      await createCheck(
        created.id,
        CheckInput.parse({ ...c, derivedInputs: inputs ?? null }),
        actor,
      )
    }
  }
  for (const line of data.bom)
    await createBomLine(
      revisionId,
      {
        partId: partIds.get(line.partNumber)!,
        quantity: line.quantity,
        refDesignators: line.refDesignators ?? '',
        fittedAtStepId: stepIds.get(line.fittedAtStep) ?? null,
        traceLevel: line.traceLevel ?? 'lot',
      },
      actor,
    )
}

async function loadParts(actor: Actor): Promise<Map<string, string>> {
  const ids = new Map<string, string>()
  for (const p of DEMO_PARTS) {
    const existing = await Part.findOne({ where: { partNumber: p.partNumber } })
    ids.set(p.partNumber, existing?.id ?? (await createPart(p, actor)).id)
  }
  return ids
}

async function loadProducts(partIds: Map<string, string>, actor: Actor): Promise<void> {
  for (const p of DEMO_PRODUCTS) {
    if (await Product.findOne({ where: { code: p.code } })) continue
    const product = await createProduct(
      { code: p.code, name: p.name, description: p.description },
      actor,
    )
    let draftId = product.revisions[0]!.id
    for (const [i, rev] of p.revisions.entries()) {
      if (i > 0) draftId = (await createRevision(product.id, actor)).id
      await fillRevision(draftId, rev, partIds, actor)
      await releaseRevision(draftId, actor)
      if (rev.status === 'obsolete') await obsoleteRevision(draftId, actor)
    }
  }
  // A draft C of the big unit, copied from B, so an engineer has something to edit.
  const fp24 = DEMO_PRODUCTS[0]!
  const product = await Product.findOne({ where: { code: fp24.code }, include: ['revisions'] })
  const b = product?.revisions?.find((r) => r.letter === 'B')
  if (b && product?.revisions?.length === 2) await copyRevision(b.id, actor)
}

async function loadReceiving(
  partIds: Map<string, string>,
  actor: Actor,
  anchor: Date,
): Promise<void> {
  for (const d of DEMO_DEFECT_CODES)
    if (!(await DefectCode.findOne({ where: { code: d.code } }))) await createDefectCode(d, actor)
  if ((await ComponentLot.count()) > 0) return
  for (const l of DEMO_COMPONENT_LOTS) {
    const lot = await receiveComponentLot(
      {
        partId: partIds.get(l.partNumber)!,
        supplierName: l.supplierName,
        supplierLotCode: l.supplierLotCode,
        quantityReceived: l.quantityReceived,
        receivedOn: daysBefore(anchor, l.receivedDaysAgo),
        expiresOn: l.expiresInDays === undefined ? null : daysBefore(anchor, -l.expiresInDays),
        notes: '',
      },
      actor,
    )
    if (l.quarantine)
      await setComponentLotStatus(lot.id, { status: 'quarantined', reason: l.quarantine }, actor)
  }
}

/** Parts, products with their revisions, defect codes and component lots of the demo shop. */
export async function loadDemoRecipes(actor: Actor, anchor: Date): Promise<void> {
  const partIds = await loadParts(actor)
  await loadProducts(partIds, actor)
  await loadReceiving(partIds, actor, anchor)
}
