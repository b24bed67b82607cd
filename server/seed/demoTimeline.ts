import { randomUUID } from 'node:crypto'
import type { CheckValue } from '../../shared/recipes/evaluate'
import type { Role } from '../../shared/roles'
import type { RevisionDto } from '../../shared/schemas/recipes'
import { DefectCode } from '../models'
import type { Actor } from '../services/admin'
import { recordStepRun } from '../services/floor'
import { LATE_SHIFT_FROM_MINUTE } from './demoClock'
import type { DemoClock } from './demoClock'
import type { DemoAlerts } from './demoAlerts'
import { demoReadings, gaussian, seededRandom, SeriesMemory } from './demoReadings'
import { DEMO_PASSWORD } from './demoUsers'

// The floor of the demo's past: a lot's story is a timeline of step runs and decisions, played in
// the order of their shop times through the same services as the Floor, the Lots screen and the
// Yield board, each stamped with its own time. Anything timed at or after the anchor has not
// happened yet and is left out: that is how lots come to be spread along their route.

export type Person = Actor & { role: Role; name: string }

/** The demo people the story needs, by what they do. */
export interface Cast {
  lead: Person
  engineer: Person
  stores: Person
  service: Person
  /** The operator of the early shift (06:00–14:00) and of the late one (14:00–22:00). */
  operators: [Person, Person]
}

/** Each operator reads a voltmeter a touch differently (V): early shift high, late shift low. */
const READER_BIAS_VOLTS = [0.04, -0.05]
/** Each winding bench's LCR meter: WND-1 reads 0.2 % high, WND-2 0.3 % low. */
const METER_FACTOR: Record<string, number> = { 'WND-1': 1.002, 'WND-2': 0.997 }
/** The one station of each other kind. */
const STATION_OF_KIND: Record<string, string> = {
  soldering: 'SLD-1',
  hipot: 'HPT-1',
  load_test: 'LDT-1',
  inspection: 'INS-1',
  packing: 'PCK-1',
}

/**
 * Everything one seed run shares: its clock, people, the last value of every series, and the
 * alerts judged as the story goes (none when absent).
 */
export interface Scene {
  clock: DemoClock
  cast: Cast
  memory: SeriesMemory
  alerts?: DemoAlerts
}

export interface LotPlan {
  /** Seeds this lot's random draws, so each lot is the same whatever runs beside it. */
  seed: number
  productCode: 'FP24' | 'FP12'
  letter: string
  quantity: number
  orderRef: string
  customerId: string | null
  customerName: string
  /** Working day the order is due (may lie after the anchor). */
  dueDay: number
  planned: { day: number; minute: number }
  released?: { day: number; minute: number }
  /** The supplier lot code of the core lot every unit of this lot is wound on. */
  coreLot: string
  /** That core lot's own AL relative to the nominal. */
  coreAlFactor: number
}

export interface RunItem {
  kind: 'run'
  at: Date
  unit: number
  position: number
  bench: string
  turns: number
  /** A run after a disposition (rework): runs although the unit failed before. */
  isExtra: boolean
  override?: Record<string, CheckValue>
  defectCode?: string
}
export interface ActionItem {
  kind: 'action'
  at: Date
  act: () => Promise<void>
  /** It takes a shop-wide number (a shipment, a return): played alone, in time order. */
  isShopWide: boolean
}
export type Item = RunItem | ActionItem

/** A lot being told: its rows, its plan and the timeline still to play. */
export class LotTimeline {
  readonly items: Item[] = []
  /** The open nonconformance of each unit whose run failed, by unit index. */
  readonly failed = new Map<number, string>()
  /** Units whose normal route stopped at a failure; only extra runs move them now. */
  private readonly stopped = new Set<number>()
  /** Units held (a containment): nothing more is run on them. */
  readonly held = new Set<number>()
  /** The serials shipped, once the story has shipped them. */
  shipped: string[] = []
  private readonly alFactors: number[]
  private readonly rnd: () => number
  private readonly timesSeen = new Set<string>()

  constructor(
    readonly scene: Scene,
    readonly plan: LotPlan,
    readonly lotId: string,
    readonly revision: RevisionDto,
    readonly serials: string[],
    private readonly lotCodes: Map<string, string>,
  ) {
    this.rnd = seededRandom(plan.seed)
    // Cores of one lot still differ a little: 0.4 % (1σ) around the core lot's own AL.
    this.alFactors = serials.map(() => plan.coreAlFactor * (1 + gaussian(this.rnd) * 0.004))
  }

  /** Adds a step run of unit `unit` at route position `position`, at shop time day/minute. */
  run(
    unit: number,
    position: number,
    day: number,
    minute: number,
    opts: Partial<Pick<RunItem, 'bench' | 'turns' | 'override' | 'defectCode' | 'isExtra'>> = {},
  ): void {
    const at = this.scene.clock.at(day, minute)
    // The statistics order a series by time: two runs of a step at one instant would be ambiguous.
    const key = `${position}@${at.getTime()}`
    if (this.timesSeen.has(key))
      throw new Error(`demo seed: two runs of step ${position} at ${at.toISOString()}`)
    this.timesSeen.add(key)
    this.items.push({
      kind: 'run',
      at,
      unit,
      position,
      bench: opts.bench ?? 'WND-1',
      turns: opts.turns ?? 0,
      isExtra: opts.isExtra ?? false,
      override: opts.override,
      defectCode: opts.defectCode,
    })
  }

  /** Adds a decision or another act on this lot alone at shop time day/minute. */
  at(day: number, minute: number, act: () => Promise<void>): void {
    this.items.push({
      kind: 'action',
      at: this.scene.clock.at(day, minute),
      act,
      isShopWide: false,
    })
  }

  /** Adds an act that takes a shop-wide number (a shipment, a return) at shop time day/minute. */
  atShop(day: number, minute: number, act: () => Promise<void>): void {
    this.items.push({ kind: 'action', at: this.scene.clock.at(day, minute), act, isShopWide: true })
  }

  /**
   * Adds every unit's normal route: unit `i` starts on `firstDay + ⌊i / perDay⌋`, each next step
   * `lag` working days later, units of one day spaced through both shifts.
   */
  flow(opts: {
    firstDay: number
    perDay: number
    lag?: number
    bench?: (i: number) => string
    turns?: (i: number) => number
    failures?: {
      unit: number
      position: number
      override: Record<string, CheckValue>
      defectCode: string
    }[]
  }): void {
    const lag = opts.lag ?? 1
    const spacing = Math.floor(900 / opts.perDay)
    for (const [i] of this.serials.entries())
      for (const step of this.revision.steps) {
        const day = opts.firstDay + Math.floor(i / opts.perDay) + (step.position - 1) * lag
        const minute = 15 + (i % opts.perDay) * spacing + step.position * 4
        const failure = opts.failures?.find((f) => f.unit === i && f.position === step.position)
        this.run(i, step.position, day, minute, {
          bench: opts.bench?.(i) ?? 'WND-1',
          turns: opts.turns?.(i) ?? this.nominalTurns(),
          override: failure?.override,
          defectCode: failure?.defectCode,
        })
      }
  }

  nominalTurns(): number {
    return this.revision.windings.find((w) => w.name === 'secondary')!.nominalTurns
  }

  stepAt(position: number) {
    return this.revision.steps.find((s) => s.position === position)!
  }

  /** This timeline's items up to the anchor, in time order; later ones have not happened yet. */
  due(): Item[] {
    return this.items
      .filter((it) => it.at < this.scene.clock.anchor)
      .sort((a, b) => a.at.getTime() - b.at.getTime())
  }

  async playInOrder(items: Item[]): Promise<void> {
    for (const it of items) {
      if (it.kind === 'run') await this.record(it)
      else await it.act()
    }
  }

  private async record(it: RunItem): Promise<void> {
    if (this.held.has(it.unit)) return
    if (this.stopped.has(it.unit) && !it.isExtra) return
    const step = this.stepAt(it.position)
    const serial = this.serials[it.unit]!
    const minuteOfDay = it.at.getUTCHours() * 60 + it.at.getUTCMinutes() - 6 * 60
    const shift = minuteOfDay < LATE_SHIFT_FROM_MINUTE ? 0 : 1
    const operator = this.scene.cast.operators[shift]
    const isWinding = step.stationKind === 'winding'
    const values = demoReadings(
      step,
      this.revision.windings,
      {
        secondaryTurns: it.turns,
        alFactor: this.alFactors[it.unit]!,
        meterFactor: isWinding ? (METER_FACTOR[it.bench] ?? 1) : 1,
        readerBiasVolts: READER_BIAS_VOLTS[shift]!,
        override: it.override,
      },
      this.rnd,
      this.scene.memory,
      this.lotId,
    )
    const consumptions = this.revision.bom
      .filter((b) => b.fittedAtStepId === step.id)
      .map((l) => ({
        bomLineId: l.id,
        code: this.lotCodes.get(l.partId)!,
        itemSerial: l.traceLevel === 'serial' ? `${l.partNumber}-${serial.slice(-6)}` : undefined,
      }))
    const defect = it.defectCode
      ? await DefectCode.findOne({ where: { code: it.defectCode } })
      : null
    const out = await recordStepRun(
      {
        clientEventId: randomUUID(),
        serial,
        stationCode: isWinding ? it.bench : STATION_OF_KIND[step.stationKind]!,
        values,
        consumptions,
        defectCodeId: defect?.id ?? null,
        note: '',
        countersign: step.requiresSignoff
          ? { email: this.scene.cast.lead.email!, password: DEMO_PASSWORD }
          : null,
      },
      operator,
      it.at,
    )
    // The alerts worker judges the lot's step after each scan; the story does so at its time.
    await this.scene.alerts?.afterRun(this.lotId, step.id, it.at)
    const failed = out.body.stepRun.result === 'fail'
    if (failed !== Boolean(it.defectCode))
      throw new Error(
        `demo seed: ${serial} at ${step.name} ${failed ? 'failed' : 'passed'} against the story`,
      )
    if (failed) {
      this.stopped.add(it.unit)
      this.failed.set(it.unit, out.body.nonconformanceId!)
    }
  }
}

/**
 * Plays the lots' timelines together in shop-time order. Acts that take a shop-wide number
 * (shipments, returns) are played alone, in that order, so the numbers are the same on every
 * run; between two of them each lot plays its own runs and decisions in its own order while the
 * other lots go alongside, since nothing one lot does there changes another.
 */
export async function playTogether(timelines: LotTimeline[]): Promise<void> {
  const all = timelines
    .flatMap((t, lot) => t.due().map((item, order) => ({ item, lot, order })))
    .sort((a, b) => a.item.at.getTime() - b.item.at.getTime() || a.lot - b.lot || a.order - b.order)
  let stretch: typeof all = []
  const flush = async () => {
    const items = stretch
    stretch = []
    await Promise.all(
      timelines.map((t, lot) =>
        t.playInOrder(items.filter((b) => b.lot === lot).map((b) => b.item)),
      ),
    )
  }
  for (const entry of all) {
    if (entry.item.kind === 'action' && entry.item.isShopWide) {
      await flush()
      await entry.item.act()
    } else stretch.push(entry)
  }
  await flush()
}
