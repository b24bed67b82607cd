import { UniqueConstraintError } from 'sequelize'
import type { Transaction } from 'sequelize'
import { evaluateChecks } from '../../shared/recipes/evaluate'
import type { CheckResult } from '../../shared/recipes/evaluate'
import type { StepRunInput, StepRunResultDto } from '../../shared/schemas/lots'
import type { CheckDto } from '../../shared/schemas/recipes'
import { codeFromScan } from '../../shared/links'
import { isValidSerial, looksLikeSerial } from '../../shared/serials'
import { AppError } from '../errors'
import { db, DefectCode, Lot, Measurement, Nonconformance, Station, StepRun, Unit } from '../models'
import { recordAudit } from './audit'
import type { Actor } from './audit'
import { applyConsumptions, planConsumptions } from './consumptions'
import { verifyCountersign } from './countersign'
import { unitRefusal } from './floorRules'
import { moveUnitOn, unitSummary } from './unitMoves'
import { stepPlan } from './stepPlans'
import type { StepPlan } from './stepPlans'

const stepRef = (s: StepPlan) => ({
  id: s.id,
  name: s.name,
  stationKind: s.stationKind,
  position: s.position,
})

/** Finds a unit by what was scanned; a mistyped serial (bad check character) is a 400. */
export async function findUnitByScan(
  scanned: string,
  transaction?: Transaction,
  lock = false,
): Promise<Unit> {
  const serial = codeFromScan(scanned)
  const unit = await Unit.findOne({
    where: { serial },
    transaction,
    lock: lock && transaction ? transaction.LOCK.UPDATE : undefined,
  })
  if (unit) return unit
  if (looksLikeSerial(serial) && !isValidSerial(serial))
    throw new AppError(
      400,
      'mistyped_serial',
      `${serial} is mistyped: its check character does not match; scan it again or type it carefully`,
      { serial: 'mistyped' },
    )
  throw new AppError(404, 'unknown_serial', `no unit ${serial}: check the traveler`, {
    serial: 'unknown',
  })
}

async function resultOf(run: StepRun, input: StepRunInput): Promise<StepRunResultDto> {
  const unit = (await Unit.findByPk(run.unitId))!
  if (codeFromScan(input.serial) !== unit.serial)
    throw AppError.conflict(
      'event_reused',
      'this submission id was already used for another unit; submit again',
    )
  const nc = await Nonconformance.findOne({ where: { stepRunId: run.id } })
  return {
    stepRun: { id: run.id, result: run.result, attempt: run.attempt },
    unit: await unitSummary(unit),
    nonconformanceId: nc?.id ?? null,
  }
}

/** Typed values must be present and of the check's kind; the 400 names each bad check. */
function checkTypedValues(checks: CheckDto[], values: StepRunInput['values']): void {
  const fields: Record<string, string> = {}
  for (const c of checks.filter((c) => !c.derived)) {
    const v = values[c.key]
    const field = `values.${c.key}`
    if (v === undefined || v === null || v === '') fields[field] = `enter ${c.label}`
    else if (c.kind === 'numeric' && typeof v !== 'number') fields[field] = 'must be a number'
    else if (c.kind === 'boolean' && typeof v !== 'boolean') fields[field] = 'must be yes or no'
    else if ((c.kind === 'text' || c.kind === 'choice') && typeof v !== 'string')
      fields[field] = 'must be text'
    else if (c.kind === 'choice' && !c.choices?.some((o) => o.value === v))
      fields[field] = 'not one of the choices'
  }
  const [first] = Object.entries(fields)
  if (first) throw AppError.badRequest(`${first[0]}: ${first[1]}`, fields)
}

function measurementRows(
  stepRunId: string,
  checks: CheckDto[],
  results: Record<string, CheckResult>,
) {
  return checks.map((c) => {
    const r = results[c.key]!
    return {
      stepRunId,
      checkId: c.id,
      valueNumber: typeof r.value === 'number' ? r.value : null,
      valueText: typeof r.value === 'string' ? r.value : null,
      valueBoolean: typeof r.value === 'boolean' ? r.value : null,
      isDerived: r.isDerived,
      isPass: r.verdict === 'pass',
    }
  })
}

async function record(
  input: StepRunInput,
  actor: Actor,
  transaction: Transaction,
  at: Date,
): Promise<StepRunResultDto | { repeat: StepRun }> {
  // The row lock on the unit serialises every submission for it: a second station waits here,
  // then finds the unit moved on; a retried submission finds its own step run.
  const unit = await findUnitByScan(input.serial, transaction, true)
  const earlier = await StepRun.findOne({
    where: { clientEventId: input.clientEventId },
    transaction,
  })
  if (earlier) return { repeat: earlier }
  const station = await Station.findOne({ where: { code: input.stationCode }, transaction })
  if (!station) throw AppError.notFound(`station ${input.stationCode}`)
  // No lock on the lot: holding a lot locks each of its open units, which this run holds.
  const lot = (await Lot.findByPk(unit.lotId, { transaction }))!
  const step = unit.currentStepId ? await stepPlan(unit.currentStepId, transaction) : null
  const refusal = unitRefusal(unit, lot, step, station)
  if (refusal || !step)
    throw AppError.conflict(
      refusal?.code ?? 'no_step',
      refusal?.message ?? `${unit.serial} has no step to do`,
    )
  const checks = step.checks
  checkTypedValues(checks, input.values)
  const results = evaluateChecks(checks, input.values, step.windings)
  const failed = checks.filter((c) => results[c.key]!.verdict !== 'pass')
  const result = failed.length ? 'fail' : 'pass'
  if (result === 'fail' && !input.defectCodeId)
    throw AppError.badRequest('defectCodeId: choose a defect code for the failed check', {
      defectCodeId: 'choose a defect code',
    })
  if (input.defectCodeId && !(await DefectCode.findByPk(input.defectCodeId, { transaction })))
    throw AppError.badRequest('defectCodeId: no such defect code', {
      defectCodeId: 'no such defect code',
    })
  const planned = await planConsumptions(step.bomLines, input.consumptions, transaction)
  const second = step.requiresSignoff
    ? await verifyCountersign(
        input.countersign,
        actor,
        ['operator', 'lead', 'engineer'],
        `${step.name}`,
        transaction,
      )
    : null
  const attempt =
    (await StepRun.count({ where: { unitId: unit.id, stepId: step.id }, transaction })) + 1
  const now = at
  const run = await StepRun.create(
    {
      unitId: unit.id,
      stepId: step.id,
      stationId: station.id,
      operatorId: actor.id!,
      countersignedBy: second?.id ?? null,
      attempt,
      isRework: unit.state === 'in_rework',
      result,
      note: input.note,
      clientEventId: input.clientEventId,
      startedAt: now,
      finishedAt: now,
    },
    { transaction },
  )
  await Measurement.bulkCreate(measurementRows(run.id, checks, results), { transaction })
  await applyConsumptions(planned, unit.id, run.id, transaction)
  const nc = await moveUnitOn(
    unit,
    lot,
    step,
    run,
    failed.map((c) => c.key),
    input,
    actor,
    transaction,
  )
  await recordAudit(
    actor,
    {
      action: 'step_run.record',
      entity: 'unit',
      entityId: unit.id,
      after: {
        serial: unit.serial,
        step: step.name,
        result,
        attempt,
        station: station.code,
        countersignedBy: second?.email ?? null,
      },
    },
    transaction,
  )
  return {
    stepRun: { id: run.id, result, attempt },
    unit: await unitSummary(unit, transaction, run.result === 'pass' ? step.next : stepRef(step)),
    nonconformanceId: nc?.id ?? null,
  }
}

/**
 * Records one step run from the Floor: recomputes every verdict and derived value from the
 * values, checks the route rules and component lots, stores the run with its measurements and
 * consumptions and moves the unit on, exactly once per `clientEventId`.
 */
export async function recordStepRun(
  input: StepRunInput,
  actor: Actor,
  /** When the run happened; the demo seed spreads its lots over past days. */
  at: Date = new Date(),
): Promise<{ isRepeat: boolean; body: StepRunResultDto }> {
  const known = await StepRun.findOne({ where: { clientEventId: input.clientEventId } })
  if (known) return { isRepeat: true, body: await resultOf(known, input) }
  try {
    const out = await db().transaction((t) => record(input, actor, t, at))
    if ('repeat' in out) return { isRepeat: true, body: await resultOf(out.repeat, input) }
    return { isRepeat: false, body: out }
  } catch (err) {
    // Two submissions of one event for two different serials can both pass the look-up; the
    // unique constraint lets one in, and the other gets the first one's answer.
    if (err instanceof UniqueConstraintError && err.fields && 'client_event_id' in err.fields) {
      const winner = await StepRun.findOne({ where: { clientEventId: input.clientEventId } })
      if (winner) return { isRepeat: true, body: await resultOf(winner, input) }
    }
    throw err
  }
}
