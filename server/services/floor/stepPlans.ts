import type { Transaction } from 'sequelize'
import type { StepRefDto } from '../../../shared/schemas/lots'
import type { BomLineDto, StepDto, WindingDto } from '../../../shared/schemas/recipes'
import { BomLine, Check, Part, Revision, RouteStep, Winding } from '../../models'
import { toBomLineDto, toStepDto, toWindingDto } from '../recipes'

/** Everything the Floor needs to know about one step of a released route. */
export interface StepPlan extends StepDto {
  revisionId: string
  windings: WindingDto[]
  /** The bill-of-materials lines fitted at this step, with their parts (what the write needs). */
  bomLines: BomLine[]
  /** The same lines as the Floor shows them and the scan's decision reads them. */
  bom: BomLineDto[]
  next: StepRefDto | null
}

// Units only ever stand at steps of released revisions, and a released revision is frozen
// (every recipe change refuses with 409), so a step's plan never changes once built: keeping
// it saves the scan route five queries. Drafts are never kept.
const plans = new Map<string, StepPlan>()
const MAX_PLANS = 5000

/** The plan of a step, from memory when its revision is released. */
export async function stepPlan(
  stepId: string,
  transaction?: Transaction,
): Promise<StepPlan | null> {
  const known = plans.get(stepId)
  if (known) return known
  const step = await RouteStep.findByPk(stepId, {
    include: [{ model: Check, as: 'checks' }],
    transaction,
  })
  if (!step) return null
  // One after another: queries of one transaction share its connection.
  const revision = await Revision.findByPk(step.revisionId, { attributes: ['status'], transaction })
  const windings = await Winding.findAll({
    where: { revisionId: step.revisionId },
    order: [['position', 'ASC']],
    transaction,
  })
  const bomLines = await BomLine.findAll({
    where: { fittedAtStepId: step.id },
    include: [{ model: Part, as: 'part' }],
    order: [['position', 'ASC']],
    transaction,
  })
  const next = await RouteStep.findOne({
    where: { revisionId: step.revisionId, position: step.position + 1 },
    transaction,
  })
  const plan: StepPlan = {
    ...toStepDto(step),
    revisionId: step.revisionId,
    windings: windings.map(toWindingDto),
    bomLines,
    bom: bomLines.map(toBomLineDto),
    next: next
      ? { id: next.id, name: next.name, stationKind: next.stationKind, position: next.position }
      : null,
  }
  if (revision?.status !== 'draft') {
    if (plans.size >= MAX_PLANS) plans.clear()
    plans.set(stepId, plan)
  }
  return plan
}

/** The StepDto part of a plan, for the Floor's preview (the plan carries more). */
export function toStepDtoOf(plan: StepPlan): StepDto {
  const { id, position, name, stationKind, instructions, safetyNote, requiresSignoff, checks } =
    plan
  return { id, position, name, stationKind, instructions, safetyNote, requiresSignoff, checks }
}
