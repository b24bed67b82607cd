import { describe, expect, it } from 'vitest'
import { decideStepRun, judgeStepRun } from '../../../../shared/floor/decideStepRun'
import type {
  ScanFacts,
  StepRunDecision,
  StepRunRefusal,
  StepToDo,
} from '../../../../shared/floor/decideStepRun'
import type { LotToFit } from '../../../../shared/floor/componentLotRefusal'
import type { CheckDto } from '../../../../shared/schemas/recipes'

// No database: plain objects stand for what the scan reads. The expected words are the Floor's
// own (common practice, no source); each computed value names where it comes from.

const at = new Date('2026-12-02T09:00:00Z')

function check(over: Partial<CheckDto> & Pick<CheckDto, 'id' | 'key' | 'label'>): CheckDto {
  return {
    stepId: 'step-3',
    position: 1,
    kind: 'numeric',
    unit: 'V',
    nominal: null,
    lower: null,
    upper: null,
    decimals: 2,
    choices: null,
    derived: null,
    derivedInputs: null,
    isKey: false,
    isForCustomers: true,
    ...over,
  }
}

const vin = check({ id: 'c-vin', key: 'vin', label: 'Input voltage' })
const iin = check({ id: 'c-iin', key: 'iin', label: 'Input current', unit: 'A' })
const vout = check({ id: 'c-vout', key: 'vout', label: 'Output voltage', lower: 11.4, upper: 12.6 })
const iout = check({ id: 'c-iout', key: 'iout', label: 'Output current', unit: 'A' })
const eff = check({
  id: 'c-eff',
  key: 'eff',
  label: 'Efficiency',
  unit: '%',
  lower: 85,
  derived: 'efficiency',
  derivedInputs: { vin: 'vin', iin: 'iin', vout: 'vout', iout: 'iout' },
})

const CORE = { id: 'line-core', partId: 'part-core', partNumber: 'FCS-3000U', quantity: 1 }
const BOARD = { id: 'line-pcb', partId: 'part-pcb', partNumber: 'PCB-FP24-B', quantity: 1 }

const loadTest: StepToDo = {
  id: 'step-3',
  name: 'Load test',
  stationKind: 'load_test',
  position: 3,
  requiresSignoff: false,
  checks: [vin, iin, vout, iout, eff],
  windings: [],
  bom: [],
  next: { id: 'step-4', name: 'Packing', stationKind: 'packing', position: 4 },
}

/** 48 V × 2.5 A in, 12 V × 9 A out: a pass. */
const GOOD = { vin: 48, iin: 2.5, vout: 12, iout: 9 }

function lotToFit(over: Partial<LotToFit> = {}): LotToFit {
  return {
    id: 'cl-48',
    internalCode: 'CL-26-000048',
    partId: 'part-core',
    partNumber: 'FCS-3000U',
    status: 'available',
    expiresOn: null,
    quantityRemaining: 80,
    ...over,
  }
}

function facts(over: Partial<ScanFacts> = {}): ScanFacts {
  return {
    unit: {
      serial: 'FP24-2649-00017K',
      state: 'in_progress',
      currentStepId: 'step-3',
      reworkCount: 0,
      reworkUntilPosition: null,
      finishedAt: null,
      holdKind: null,
      heldFromState: null,
      holdReason: '',
      runsAtStep: 0,
    },
    lot: { number: 'L-0042', status: 'in_progress', isOnHold: false, holdReason: '' },
    station: { code: 'LDT-1', name: 'Load-test rack 1', kind: 'load_test', isActive: true },
    step: loadTest,
    submission: { stationCode: 'LDT-1', values: GOOD, consumptions: [], defectCodeId: null },
    isDefectCodeKnown: true,
    componentLots: [],
    countersign: null,
    actor: { id: 'u-op', email: 'operator@ferncastle.example' },
    at,
    ...over,
  }
}

const withValues = (
  values: ScanFacts['submission']['values'],
  defectCodeId: string | null = null,
) => facts({ submission: { stationCode: 'LDT-1', values, consumptions: [], defectCodeId } })

function decided(f: ScanFacts): StepRunDecision {
  const out = decideStepRun(f)
  if ('refusal' in out) throw new Error(`refused: ${out.refusal.message}`)
  return out.decision
}

function refused(f: ScanFacts): StepRunRefusal {
  const out = decideStepRun(f)
  if (!('refusal' in out)) throw new Error('expected a refusal')
  return out.refusal
}

describe('decideStepRun: a recorded run', () => {
  it('passes, computes the derived value and moves the unit to the next step', () => {
    const d = decided(facts())
    // η = Pout / Pin, the definition of efficiency (from memory): 12 V × 9 A = 108 W over
    // 48 V × 2.5 A = 120 W is 0.90, shown in % as 90.
    expect(d.results.eff).toMatchObject({ isDerived: true, verdict: 'pass' })
    expect(d.results.eff!.value).toBeCloseTo(90, 10)
    expect(d).toMatchObject({
      verdict: 'pass',
      result: 'pass',
      failedKeys: [],
      attempt: 1,
      isRework: false,
      nonconformance: null,
      fitted: [],
      countersignedBy: null,
      move: { state: 'in_progress', currentStepId: 'step-4', finishedAt: null },
      unit: { serial: 'FP24-2649-00017K', state: 'in_progress', currentStep: loadTest.next },
      audit: {
        serial: 'FP24-2649-00017K',
        step: 'Load test',
        result: 'pass',
        attempt: 1,
        station: 'LDT-1',
        countersignedBy: null,
      },
    })
  })

  it('passes a value on a limit: limits are inclusive (shared/recipes/evaluate.ts)', () => {
    expect(decided(withValues({ ...GOOD, vout: 12.6, iout: 8.5 })).result).toBe('pass')
  })

  it('fails below a limit, holds the unit at its step and opens a nonconformance', () => {
    // 11 V × 9 A = 99 W over 120 W is 82.5 % (η = Pout / Pin, from memory), under the 85 % limit.
    const d = decided(withValues({ ...GOOD, vout: 11 }, 'defect-vout'))
    expect(d.results.eff!.value).toBeCloseTo(82.5, 10)
    expect(d).toMatchObject({
      result: 'fail',
      failedKeys: ['vout', 'eff'],
      nonconformance: { defectCodeId: 'defect-vout', failedChecks: ['vout', 'eff'] },
      move: {
        state: 'on_hold',
        currentStepId: 'step-3',
        holdKind: 'nonconformance',
        heldFromState: 'in_progress',
        holdReason: 'failed Load test (vout, eff)',
      },
      unit: { state: 'on_hold', currentStep: { id: 'step-3', name: 'Load test' } },
    })
  })

  it('fails a run whose derived value cannot be computed, with one overall verdict', () => {
    // No input power: the efficiency formula has no value (shared/converter.ts throws a RangeError).
    const d = decided(withValues({ ...GOOD, iin: 0 }, 'defect-eff'))
    expect(d.results.eff).toMatchObject({ value: null, verdict: 'missing' })
    expect(d).toMatchObject({ verdict: 'missing', result: 'fail', failedKeys: ['eff'] })
  })

  it('ends the route as passed after the last step, finished at the time passed in', () => {
    const last = { ...loadTest, next: null }
    expect(decided(facts({ step: last })).move).toMatchObject({
      state: 'passed',
      currentStepId: null,
      finishedAt: at,
    })
  })

  it('counts rework attempts and keeps the unit in rework until the failed step passes again', () => {
    const reworking = {
      ...facts().unit,
      state: 'in_rework' as const,
      reworkCount: 1,
      reworkUntilPosition: 3,
      runsAtStep: 2,
    }
    const atFailedStep = decided(facts({ unit: reworking }))
    expect(atFailedStep).toMatchObject({
      attempt: 3,
      isRework: true,
      move: { state: 'in_progress', reworkUntilPosition: null },
      unit: { reworkCount: 1 },
    })
    const earlier = { ...loadTest, position: 2 }
    expect(decided(facts({ unit: reworking, step: earlier }))).toMatchObject({
      attempt: 3,
      isRework: true,
      move: { state: 'in_rework', reworkUntilPosition: 3 },
    })
  })

  it('reads nothing but its facts: the same facts give the same decision and stay as they were', () => {
    const f = facts()
    const copy = structuredClone(f)
    expect(decideStepRun(f)).toEqual(decideStepRun(f))
    expect(f).toEqual(copy)
  })
})

describe('decideStepRun: refusals, in the order the operator hears them', () => {
  it('an unknown station is a 404', () => {
    expect(refused(facts({ station: null }))).toEqual({
      status: 404,
      code: 'not_found',
      message: 'station LDT-1 not found',
    })
  })

  it('the route rules are a 409 with their own code, before any value is looked at', () => {
    const unit = facts().unit
    const bad = { vout: 'twelve' }
    const cases: [Partial<ScanFacts>, string][] = [
      [{ station: { ...facts().station!, isActive: false } }, 'station_inactive'],
      [{ lot: { ...facts().lot, status: 'planned' } }, 'lot_not_released'],
      [{ lot: { ...facts().lot, status: 'closed' } }, 'lot_closed'],
      [{ lot: { ...facts().lot, isOnHold: true, holdReason: 'core lot' } }, 'lot_on_hold'],
      [{ unit: { ...unit, state: 'on_hold', holdReason: 'dropped' } }, 'unit_on_hold'],
      [{ unit: { ...unit, state: 'scrapped' }, step: null }, 'unit_scrapped'],
      [{ unit: { ...unit, state: 'passed' }, step: null }, 'unit_finished'],
      [{ step: null }, 'no_step'],
      [{ step: { ...loadTest, stationKind: 'hipot', name: 'Hipot' } }, 'not_due_here'],
    ]
    for (const [over, code] of cases) {
      const f = facts(over)
      const r = refused({ ...f, submission: { ...f.submission, values: bad } })
      expect(r, code).toMatchObject({ status: 409, code })
    }
    expect(refused(facts({ step: { ...loadTest, stationKind: 'hipot', name: 'Hipot' } }))).toEqual({
      status: 409,
      code: 'not_due_here',
      message: 'FP24-2649-00017K is waiting for Hipot; this is Load-test rack 1',
    })
  })

  it('a missing or mistyped value is a 400 naming every field', () => {
    const r = refused(withValues({ vin: 48, iin: '2.5', vout: '  ' }))
    expect(r).toEqual({
      status: 400,
      code: 'validation_failed',
      message: 'values.iin: must be a number',
      fields: {
        'values.iin': 'must be a number',
        'values.vout': 'enter Output voltage',
        'values.iout': 'enter Output current',
      },
    })
  })

  it('a yes/no or choice check takes only its kind of value', () => {
    const ok = check({
      id: 'c-ok',
      key: 'looks_ok',
      label: 'Looks right',
      kind: 'boolean',
      unit: null,
    })
    const finish = check({
      id: 'c-finish',
      key: 'finish',
      label: 'Finish',
      kind: 'choice',
      unit: null,
      choices: [
        { value: 'clean', isPass: true },
        { value: 'flux', isPass: false },
      ],
    })
    const step = { ...loadTest, checks: [ok, finish] }
    const sub = (values: ScanFacts['submission']['values']) =>
      refused(facts({ step, submission: { ...facts().submission, values } })).fields
    expect(sub({ looks_ok: 'yes', finish: 'shiny' })).toEqual({
      'values.looks_ok': 'must be yes or no',
      'values.finish': 'not one of the choices',
    })
    expect(sub({ looks_ok: true, finish: 3 })).toEqual({ 'values.finish': 'must be text' })
  })

  it('a fail needs a defect code, and the defect code must exist', () => {
    expect(refused(withValues({ ...GOOD, vout: 11 }))).toMatchObject({
      status: 400,
      fields: { defectCodeId: 'choose a defect code' },
    })
    const unknown = { ...withValues({ ...GOOD, vout: 11 }, 'defect-x'), isDefectCodeKnown: false }
    expect(refused(unknown)).toMatchObject({
      status: 400,
      message: 'defectCodeId: no such defect code',
    })
  })
})

describe('decideStepRun: component lots and serial-traced parts', () => {
  const step: StepToDo = {
    ...loadTest,
    bom: [
      { ...CORE, traceLevel: 'lot' },
      { ...BOARD, traceLevel: 'serial' },
    ],
  }
  const board = lotToFit({
    id: 'cl-99',
    internalCode: 'CL-26-000099',
    partId: 'part-pcb',
    partNumber: 'PCB-FP24-B',
  })
  const scanned = (
    consumptions: ScanFacts['submission']['consumptions'],
    lots: LotToFit[] = [lotToFit(), board],
    when = at,
  ) =>
    facts({
      step,
      submission: { ...facts().submission, consumptions },
      componentLots: lots,
      at: when,
    })
  const both = (itemSerial?: string) => [
    { bomLineId: CORE.id, code: 'https://w.example/c/cl-26-000048', itemSerial: 'IGNORED' },
    { bomLineId: BOARD.id, code: 'CL-26-000099', itemSerial },
  ]

  it('fits a lot per line; a serial-traced line keeps its item serial, upper case', () => {
    expect(decided(scanned(both(' pcb-0007 '))).fitted).toEqual([
      { bomLineId: CORE.id, componentLotId: 'cl-48', itemSerial: null },
      { bomLineId: BOARD.id, componentLotId: 'cl-99', itemSerial: 'PCB-0007' },
    ])
  })

  it('a serial-traced line without the item serial is a 400 on its line', () => {
    for (const itemSerial of [undefined, '   '])
      expect(refused(scanned(both(itemSerial)))).toEqual({
        status: 400,
        code: 'validation_failed',
        message: `consumptions.${BOARD.id}: scan the serial of the PCB-FP24-B fitted`,
        fields: { [`consumptions.${BOARD.id}`]: 'scan the item’s serial' },
      })
  })

  it('a part serial already fitted to a unit, from any lot of the part, is a 409 naming it', () => {
    const facts = scanned(both('pcb-0007'))
    const elsewhere = { partId: 'part-pcb', itemSerial: 'PCB-0007', unitSerial: 'FP24-2649-00017K' }
    expect(refused({ ...facts, fittedSerials: [elsewhere] })).toEqual({
      status: 409,
      code: 'item_serial_used',
      message: 'PCB-FP24-B serial PCB-0007 is already fitted to unit FP24-2649-00017K',
      fields: { [`consumptions.${BOARD.id}`]: 'already fitted to unit FP24-2649-00017K' },
    })
    // The same serial of another part is another item.
    const otherPart = { ...elsewhere, partId: 'part-core' }
    expect(decided({ ...facts, fittedSerials: [otherPart] }).fitted).toHaveLength(2)
  })

  it('a line with no scan, or a code that names no lot, is a 400 on its line, first line first', () => {
    expect(refused(scanned([both('P-1')[1]!])).fields).toEqual({
      [`consumptions.${CORE.id}`]: 'scan a lot of FCS-3000U',
    })
    expect(refused(scanned(both('P-1'), [board])).fields).toEqual({
      [`consumptions.${CORE.id}`]: 'no component lot https://w.example/c/cl-26-000048',
    })
  })

  it('a lot that may not be fitted is a 409 saying why', () => {
    const r = refused(scanned(both('P-1'), [lotToFit({ status: 'quarantined' }), board]))
    expect(r).toEqual({
      status: 409,
      code: 'component_lot_refused',
      message: 'CL-26-000048 is quarantined; take a lot that is available',
      fields: {
        [`consumptions.${CORE.id}`]: 'CL-26-000048 is quarantined; take a lot that is available',
      },
    })
  })

  it('judges expiry on the day of the run passed in, not on today', () => {
    const expiring = [lotToFit({ expiresOn: '2026-12-02' }), board]
    expect(decided(scanned(both('P-1'), expiring)).fitted).toHaveLength(2)
    const dayAfter = new Date('2026-12-03T00:00:00Z')
    expect(refused(scanned(both('P-1'), expiring, dayAfter)).message).toBe(
      'CL-26-000048 expired on 2026-12-02; return it to stores',
    )
  })

  it('checks the lots only after the values', () => {
    const f = scanned([])
    expect(refused({ ...f, submission: { ...f.submission, values: {} } }).message).toMatch(
      /^values\.vin/,
    )
  })
})

describe('decideStepRun: a step that needs a second signature', () => {
  const step = { ...loadTest, requiresSignoff: true }
  const lead = {
    id: 'u-lead',
    email: 'lead@ferncastle.example',
    role: 'lead' as const,
    isActive: true,
  }
  const signed = (countersign: ScanFacts['countersign']) => facts({ step, countersign })

  it('records who countersigned, in the run and in its audit row', () => {
    const d = decided(signed({ email: lead.email, user: lead, isPasswordRight: true }))
    expect(d.countersignedBy).toEqual({ id: 'u-lead', email: 'lead@ferncastle.example' })
    expect(d.audit.countersignedBy).toBe('lead@ferncastle.example')
  })

  it('refuses none, a wrong password, oneself and a role that may not sign', () => {
    expect(refused(signed(null))).toMatchObject({
      status: 400,
      message: 'countersign: Load test needs a second person to sign',
      fields: { countersign: 'a second person must sign' },
      isCountersignFailure: false,
    })
    const wrong = refused(signed({ email: lead.email, user: lead, isPasswordRight: false }))
    expect(wrong).toMatchObject({
      fields: { countersign: 'e-mail or password is wrong' },
      isCountersignFailure: true,
    })
    const nobody = refused(signed({ email: 'x@y.example', user: null, isPasswordRight: false }))
    expect(nobody.isCountersignFailure).toBe(true)
    const retired = { ...lead, isActive: false }
    expect(
      refused(signed({ email: lead.email, user: retired, isPasswordRight: true })).fields,
    ).toEqual({ countersign: 'e-mail or password is wrong' })
    const self = { ...lead, id: 'u-op' }
    expect(
      refused(signed({ email: lead.email, user: self, isPasswordRight: true })).fields,
    ).toEqual({ countersign: 'must be someone else' })
    const stores = { ...lead, role: 'stores' as const }
    expect(
      refused(signed({ email: lead.email, user: stores, isPasswordRight: true })).fields,
    ).toEqual({ countersign: 'needs operator or lead or engineer' })
  })

  it('asks for no signature on a step that does not need one', () => {
    expect(decided(facts({ countersign: null })).countersignedBy).toBeNull()
  })
})

describe('judgeStepRun', () => {
  it('says missing while a value is still to be typed, as the Floor form shows it', () => {
    const j = judgeStepRun(loadTest, { vin: 48, iin: 2.5 })
    expect(j.verdict).toBe('missing')
    expect(j.results.vout!.verdict).toBe('missing')
    expect(j.result).toBe('fail')
  })

  it('says fail as soon as one check fails, even with others missing', () => {
    // 13 V is above the 12.6 V upper limit.
    expect(judgeStepRun(loadTest, { vout: 13 }).verdict).toBe('fail')
  })
})
