import type { DispositionInput, NonconformanceDto } from '../../../shared/schemas/lots'
import { AppError } from '../../errors'
import { Lot, Nonconformance, RouteStep, StepRun, Unit } from '../../models'
import { auditAction } from '../admin'
import type { Actor } from '../admin'
import { verifyCountersign } from '../auth'
import { reworkTarget, scrapUnit, sendToRework, stepAfter } from '../units'
import { isoTime, isoTimeOrNull, pickCamel } from '../presenters'
import { select, withTransaction } from '../../db/sql'

// A failed scan opens its nonconformance in the scan's batched write (`opened` in WRITE_RUNS,
// stepRunSql.ts), with the defect code and failed check keys decideStepRun chose; a change to
// what an open nonconformance holds goes there too.

interface NcRow {
  id: string
  serial: string
  lot_number: string
  step_name: string
  step_position: number
  code: string | null
  code_description: string | null
  description: string
  failed_checks: string[]
  disposition: NonconformanceDto['disposition']
  failed_labels: string[]
  rework_step_name: string | null
  reason: string
  opened_by: string | null
  decided_by: string | null
  countersigned_by: string | null
  opened_at: Date
  closed_at: Date | null
}

const SELECT_NC = `
  SELECT nc.id, u.serial, l.number AS lot_number, s.name AS step_name, s.position AS step_position,
         dc.code, dc.description AS code_description, nc.description, nc.failed_checks, nc.disposition,
         ARRAY(SELECT c.label FROM checks c
                WHERE c.step_id = sr.step_id
                  AND c.key IN (SELECT jsonb_array_elements_text(nc.failed_checks))
                ORDER BY c.position) AS failed_labels,
         rs.name AS rework_step_name, nc.reason, ob.name AS opened_by, db.name AS decided_by,
         cb.name AS countersigned_by, nc.opened_at, nc.closed_at
    FROM nonconformances nc
    JOIN units u ON u.id = nc.unit_id
    JOIN lots l ON l.id = u.lot_id
    JOIN step_runs sr ON sr.id = nc.step_run_id
    JOIN route_steps s ON s.id = sr.step_id
    LEFT JOIN defect_codes dc ON dc.id = nc.defect_code_id
    LEFT JOIN route_steps rs ON rs.id = nc.rework_to_step_id
    LEFT JOIN users ob ON ob.id = nc.opened_by
    LEFT JOIN users db ON db.id = nc.decided_by
    LEFT JOIN users cb ON cb.id = nc.countersigned_by`

function toDto(r: NcRow): NonconformanceDto {
  return {
    ...pickCamel(r, [
      'id',
      'serial',
      'lot_number',
      'step_name',
      'step_position',
      'description',
      'failed_checks',
      'disposition',
      'reason',
      'opened_by',
      'decided_by',
      'countersigned_by',
    ]),
    defectCode: r.code,
    defectDescription: r.code_description,
    failedCheckLabels: r.failed_labels,
    status: r.closed_at ? 'closed' : 'open',
    reworkToStepName: r.rework_step_name,
    openedAt: isoTime(r.opened_at),
    closedAt: isoTimeOrNull(r.closed_at),
  }
}

/** Nonconformances, oldest open first, filtered by lot, unit and status. */
export async function listNonconformances(q: {
  lotId?: string
  serial?: string
  status?: 'open' | 'closed'
}): Promise<NonconformanceDto[]> {
  const where = ['TRUE']
  if (q.lotId) where.push('u.lot_id = :lotId')
  if (q.serial) where.push('u.serial = :serial')
  if (q.status === 'open') where.push('nc.closed_at IS NULL')
  if (q.status === 'closed') where.push('nc.closed_at IS NOT NULL')
  const rows = await select<NcRow>(
    `${SELECT_NC} WHERE ${where.join(' AND ')} ORDER BY nc.opened_at`,
    { replacements: q },
  )
  return rows.map(toDto)
}

async function getNonconformance(id: string): Promise<NonconformanceDto> {
  const [row] = await select<NcRow>(`${SELECT_NC} WHERE nc.id = :id`, {
    replacements: { id },
  })
  if (!row) throw AppError.notFound(`nonconformance ${id}`)
  return toDto(row)
}

/**
 * Decides what happens to a held unit. Rework sends it back to a chosen step at or before the
 * failed one; scrap ends it; use as is lets it go on past the failed step, with a written
 * reason and an engineer's signature (the decider's own when an engineer decides).
 */
export async function disposeNonconformance(
  id: string,
  input: DispositionInput,
  actor: Actor & { role: string },
  /** When it was decided, if not now: the demo seed's clock. */
  at = new Date(),
): Promise<NonconformanceDto> {
  await withTransaction(async (transaction) => {
    const nc = await Nonconformance.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!nc) throw AppError.notFound(`nonconformance ${id}`)
    if (nc.closedAt)
      throw AppError.conflict('nonconformance_closed', 'this nonconformance was already disposed')
    const unit = (await Unit.findByPk(nc.unitId, { transaction, lock: transaction.LOCK.UPDATE }))!
    const lot = (await Lot.findByPk(unit.lotId, { transaction }))!
    const run = (await StepRun.findByPk(nc.stepRunId, { transaction }))!
    const failedStep = (await RouteStep.findByPk(run.stepId, { transaction }))!
    let countersignedBy: string | null = null
    if (input.disposition === 'rework') {
      const target = await reworkTarget(
        input.reworkToStepId,
        failedStep.revisionId,
        failedStep.position,
        transaction,
        'choose a step of this route at or before the failed one',
      )
      await sendToRework(unit, target, failedStep.position, transaction)
    } else if (input.disposition === 'scrap') {
      await scrapUnit(unit, transaction, at)
    } else {
      if (input.reason.length < 10)
        throw AppError.badRequest('reason: say in a sentence why the unit may be used as it is', {
          reason: 'write at least 10 characters',
        })
      if (actor.role !== 'engineer')
        countersignedBy = (
          await verifyCountersign(input.countersign, actor, ['engineer'], 'use as is', transaction)
        ).id
      const next = await stepAfter(lot.revisionId, failedStep.position, transaction)
      await unit.update(
        {
          state: next ? 'in_progress' : 'passed',
          currentStepId: next?.id ?? null,
          finishedAt: next ? null : at,
          holdKind: null,
          heldFromState: null,
          holdReason: '',
        },
        { transaction },
      )
    }
    await nc.update(
      {
        disposition: input.disposition,
        reworkToStepId: input.disposition === 'rework' ? input.reworkToStepId : null,
        reason: input.reason,
        decidedBy: actor.id,
        countersignedBy,
        closedAt: at,
      },
      { transaction },
    )
    await auditAction(
      actor,
      'nonconformance.dispose',
      id,
      {
        at,
        before: { state: 'on_hold' },
        after: {
          serial: unit.serial,
          disposition: input.disposition,
          reworkToStepId: nc.reworkToStepId,
          reason: input.reason,
          unitState: unit.state,
          countersignedBy,
        },
      },
      transaction,
    )
  })
  return getNonconformance(id)
}
