import { Op } from 'sequelize'
import type { RevisionDto } from '../../shared/schemas/recipes'
import { ComponentLot, Product, User } from '../models'
import { createLot, listLotUnits, releaseLot } from '../services/lots'
import { getRevision } from '../services/recipes'
import { LotTimeline } from './demoTimeline'
import type { Cast, LotPlan, Person, Scene } from './demoTimeline'

// Who and what a lot's story starts from: the demo people, the revision and the component lots a
// lot is built from, and the lot itself, planned and released through the Lots service.

export async function person(email: string): Promise<Person> {
  const u = await User.findOne({ where: { email } })
  if (!u) throw new Error(`demo seed: no user ${email}`)
  return { id: u.id, email: u.email, role: u.role, name: u.name, ip: null, requestId: 'demo-seed' }
}

export async function demoCast(): Promise<Cast> {
  return {
    lead: await person('lead@ferncastle.example'),
    engineer: await person('engineer@ferncastle.example'),
    stores: await person('stores@ferncastle.example'),
    service: await person('service@ferncastle.example'),
    operators: [
      await person('operator@ferncastle.example'),
      await person('operator.late@ferncastle.example'),
    ],
  }
}

/** The released revision `letter` of a product, with its steps, windings and parts list. */
export async function demoRevision(code: string, letter: string): Promise<RevisionDto> {
  const product = await Product.findOne({ where: { code }, include: ['revisions'] })
  const rev = product?.revisions?.find((r) => r.letter === letter)
  if (!rev) throw new Error(`demo seed: no revision ${code} ${letter}`)
  return getRevision(rev.id)
}

/**
 * The component lot each part of a lot's build is taken from: the plan's core lot, and for
 * every other part the oldest available lot that has not expired by the anchor (first in, first
 * out, as stores hand them out).
 */
async function lotCodesFor(
  revision: RevisionDto,
  coreLot: string,
  anchorDate: string,
): Promise<Map<string, string>> {
  const codes = new Map<string, string>()
  for (const line of revision.bom) {
    if (codes.has(line.partId)) continue
    const isCore = line.partNumber.startsWith('FCS-')
    const lot = await ComponentLot.findOne({
      where: isCore
        ? { partId: line.partId, supplierLotCode: coreLot }
        : {
            partId: line.partId,
            status: 'available',
            [Op.or]: [{ expiresOn: null }, { expiresOn: { [Op.gt]: anchorDate } }],
          },
      order: [['receivedOn', 'ASC']],
    })
    if (!lot) throw new Error(`demo seed: no component lot for ${line.partNumber}`)
    codes.set(line.partId, lot.internalCode)
  }
  return codes
}

/** Plans (and, if the plan says so, releases) a lot; returns its timeline, empty. */
export async function startLot(scene: Scene, plan: LotPlan): Promise<LotTimeline> {
  const { clock, cast } = scene
  const revision = await demoRevision(plan.productCode, plan.letter)
  const lot = await createLot(
    {
      revisionId: revision.id,
      quantity: plan.quantity,
      orderRef: plan.orderRef,
      customerName: plan.customerName,
      customerId: plan.customerId,
      dueDate: clock.date(plan.dueDay),
    },
    cast.lead,
    clock.at(plan.planned.day, plan.planned.minute),
  )
  if (plan.released)
    await releaseLot(lot.id, cast.lead, clock.at(plan.released.day, plan.released.minute))
  const serials = plan.released ? (await listLotUnits(lot.id)).map((u) => u.serial) : []
  const codes = await lotCodesFor(revision, plan.coreLot, clock.anchor.toISOString().slice(0, 10))
  return new LotTimeline(scene, plan, lot.id, revision, serials, codes)
}
