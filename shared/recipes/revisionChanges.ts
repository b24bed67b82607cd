import type { BomLineDto, CheckDto, RevisionDto, StepDto, WindingDto } from '../schemas/recipes'

/** What part of a recipe a change touches; limits and formulas are told apart from other check fields. */
export type RecipeChangeArea = 'step' | 'check' | 'limits' | 'formula' | 'bom' | 'winding'

/** One line of a change summary, with the draft's record to point at (null when removed). */
export interface RecipeChange {
  area: RecipeChangeArea
  kind: 'added' | 'removed' | 'changed'
  /** What changed, e.g. `step 3 "Hipot"`, `check l_primary`, `bill of materials, C12-100N`. */
  subject: string
  /** How it changed, e.g. `upper limit 135 → 140 µH`; empty for an added or removed record. */
  detail: string
  /** The draft's step, check or bill-of-materials line, for linking; null when removed. */
  stepId: string | null
  checkId: string | null
  bomLineId: string | null
}

/** The part of a revision the summary compares. */
export type RecipeContent = Pick<RevisionDto, 'steps' | 'bom' | 'windings'>

type Value = string | number | boolean | null

const shown = (v: Value, unit?: string | null): string =>
  v === null || v === '' ? 'none' : `${String(v)}${unit && typeof v === 'number' ? ` ${unit}` : ''}`
const arrow = (
  what: string,
  from: Value,
  to: Value,
  unit?: string | null,
  toUnit: string | null | undefined = unit,
) => `${what} ${shown(from, unit)} → ${shown(to, toUnit)}`
const stepName = (s: StepDto) => `step ${s.position} "${s.name}"`
const norm = (text: string) => text.trim().toLowerCase()

/**
 * Pairs the base's steps with the draft's: first by name (a renamed step that stayed in place is
 * then paired by position), since copies get new ids and reordering moves positions.
 */
function pairSteps(base: readonly StepDto[], draft: readonly StepDto[]) {
  const pairs = new Map<StepDto, StepDto>()
  const free = new Set(base)
  const pair = (d: StepDto, b: StepDto | undefined) => {
    if (!b) return
    pairs.set(d, b)
    free.delete(b)
  }
  for (const d of draft)
    pair(
      d,
      [...free].find((s) => norm(s.name) === norm(d.name)),
    )
  for (const d of draft)
    if (!pairs.has(d))
      pair(
        d,
        [...free].find((s) => s.position === d.position),
      )
  return { pairs, removed: [...free] }
}

function stepChanges(d: StepDto, b: StepDto): string[] {
  const out: string[] = []
  if (norm(d.name) !== norm(b.name)) out.push(`renamed from "${b.name}"`)
  if (d.position !== b.position) out.push(`moved from position ${b.position}`)
  if (d.stationKind !== b.stationKind) out.push(arrow('station kind', b.stationKind, d.stationKind))
  if (d.instructions.trim() !== b.instructions.trim()) out.push('instructions changed')
  if (d.safetyNote.trim() !== b.safetyNote.trim()) out.push('safety note changed')
  if (d.requiresSignoff !== b.requiresSignoff)
    out.push(
      d.requiresSignoff ? 'now needs a second signature' : 'no longer needs a second signature',
    )
  return out
}

/** A derived check's inputs in words that survive a copy: windings by name, checks by key. */
function formulaText(c: CheckDto, windings: readonly WindingDto[]): string {
  if (!c.derived) return 'none'
  const inputs = Object.entries(c.derivedInputs ?? {})
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([name, ref]) => `${name}=${windings.find((w) => w.id === ref)?.name ?? ref}`)
  return inputs.length ? `${c.derived}(${inputs.join(', ')})` : c.derived
}

function checkChanges(
  d: CheckDto,
  b: CheckDto,
  windings: { draft: readonly WindingDto[]; base: readonly WindingDto[] },
): { area: RecipeChangeArea; detail: string }[] {
  const out: { area: RecipeChangeArea; detail: string }[] = []
  for (const [field, what] of [
    ['lower', 'lower limit'],
    ['nominal', 'nominal'],
    ['upper', 'upper limit'],
  ] as const)
    if (d[field] !== b[field])
      out.push({ area: 'limits', detail: arrow(what, b[field], d[field], b.unit, d.unit) })
  const fBase = formulaText(b, windings.base)
  const fDraft = formulaText(d, windings.draft)
  if (fBase !== fDraft) out.push({ area: 'formula', detail: arrow('formula', fBase, fDraft) })
  for (const field of ['label', 'kind', 'unit', 'decimals'] as const)
    if (d[field] !== b[field]) out.push({ area: 'check', detail: arrow(field, b[field], d[field]) })
  const choices = (c: CheckDto) =>
    (c.choices ?? []).map((o) => `${o.value}${o.isPass ? ' (pass)' : ''}`).join(', ')
  if (choices(d) !== choices(b))
    out.push({ area: 'check', detail: arrow('choices', choices(b), choices(d)) })
  return out
}

function windingChanges(d: WindingDto, b: WindingDto): string[] {
  const out: string[] = []
  if (d.nominalTurns !== b.nominalTurns) out.push(arrow('turns', b.nominalTurns, d.nominalTurns))
  if (d.alNanoHenry !== b.alNanoHenry)
    out.push(arrow('AL', b.alNanoHenry, d.alNanoHenry, 'nH/turn²'))
  if (d.alTolerancePercent !== b.alTolerancePercent)
    out.push(arrow('AL tolerance', b.alTolerancePercent, d.alTolerancePercent, '%'))
  if (d.coreAreaMm2 !== b.coreAreaMm2)
    out.push(arrow('core area', b.coreAreaMm2, d.coreAreaMm2, 'mm²'))
  return out
}

function bomChanges(
  d: BomLineDto,
  b: BomLineDto,
  stepOf: { draft: (id: string | null) => string; base: (id: string | null) => string },
): string[] {
  const out: string[] = []
  if (d.quantity !== b.quantity)
    out.push(arrow('quantity', b.quantity, d.quantity, d.unitOfMeasure))
  if (d.refDesignators.trim() !== b.refDesignators.trim())
    out.push(arrow('designators', b.refDesignators.trim(), d.refDesignators.trim()))
  const fittedBase = stepOf.base(b.fittedAtStepId)
  const fittedDraft = stepOf.draft(d.fittedAtStepId)
  if (fittedBase !== fittedDraft) out.push(arrow('fitted at', fittedBase, fittedDraft))
  if (d.traceLevel !== b.traceLevel) out.push(arrow('traced by', b.traceLevel, d.traceLevel))
  return out
}

/** Pairs records by a key, in order, so two lines of one part pair first with first. */
function pairBy<T>(base: readonly T[], draft: readonly T[], key: (t: T) => string) {
  const free = [...base]
  const pairs: [T, T | null][] = draft.map((d) => {
    const i = free.findIndex((b) => key(b) === key(d))
    return [d, i < 0 ? null : free.splice(i, 1)[0]!]
  })
  return { pairs, removed: free }
}

/**
 * What a draft changes against the revision it was copied from: steps, checks, limits,
 * formulas, windings and the bill of materials, in route order. Records are paired by what
 * survives a copy (step names, check keys, winding names, part numbers), never by id.
 * @param base the revision the draft was copied from
 * @param draft the draft as it stands
 */
export function summarizeRecipeChanges(base: RecipeContent, draft: RecipeContent): RecipeChange[] {
  const changes: RecipeChange[] = []
  const add = (c: Omit<RecipeChange, 'stepId' | 'checkId' | 'bomLineId'> & Partial<RecipeChange>) =>
    changes.push({ stepId: null, checkId: null, bomLineId: null, ...c })

  const steps = pairSteps(base.steps, draft.steps)
  const baseStepOfDraft = (d: StepDto) => steps.pairs.get(d) ?? null
  for (const d of draft.steps) {
    const b = baseStepOfDraft(d)
    if (!b) add({ area: 'step', kind: 'added', subject: stepName(d), detail: '', stepId: d.id })
    else
      for (const detail of stepChanges(d, b))
        add({ area: 'step', kind: 'changed', subject: stepName(d), detail, stepId: d.id })
  }
  for (const b of steps.removed)
    add({ area: 'step', kind: 'removed', subject: stepName(b), detail: '' })

  const baseChecks = new Map(
    base.steps.flatMap((s) => s.checks.map((c) => [c.key, { c, s }] as const)),
  )
  const windings = { draft: draft.windings, base: base.windings }
  for (const d of draft.steps)
    for (const c of d.checks) {
      const at = { subject: `check ${c.key}`, stepId: d.id, checkId: c.id }
      const was = baseChecks.get(c.key)
      baseChecks.delete(c.key)
      if (!was) {
        add({ area: 'check', kind: 'added', ...at, detail: `on ${stepName(d)}` })
        continue
      }
      if (baseStepOfDraft(d) !== was.s)
        add({
          area: 'check',
          kind: 'changed',
          ...at,
          detail: `moved from ${stepName(was.s)} to ${stepName(d)}`,
        })
      for (const { area, detail } of checkChanges(c, was.c, windings))
        add({ area, kind: 'changed', ...at, detail })
    }
  for (const { c, s } of baseChecks.values())
    add({
      area: 'check',
      kind: 'removed',
      subject: `check ${c.key}`,
      detail: `was on ${stepName(s)}`,
    })

  const windingPairs = pairBy(base.windings, draft.windings, (w) => norm(w.name))
  for (const [d, b] of windingPairs.pairs) {
    const subject = `winding ${d.name}`
    if (!b) add({ area: 'winding', kind: 'added', subject, detail: '' })
    else
      for (const detail of windingChanges(d, b))
        add({ area: 'winding', kind: 'changed', subject, detail })
  }
  for (const b of windingPairs.removed)
    add({ area: 'winding', kind: 'removed', subject: `winding ${b.name}`, detail: '' })

  const nameOf = (list: readonly StepDto[]) => (id: string | null) => {
    const s = list.find((x) => x.id === id)
    return s ? `"${s.name}"` : 'no step'
  }
  const stepOf = { draft: nameOf(draft.steps), base: nameOf(base.steps) }
  const bomPairs = pairBy(base.bom, draft.bom, (l) => l.partNumber)
  for (const [d, b] of bomPairs.pairs) {
    const at = { subject: `bill of materials, ${d.partNumber}`, bomLineId: d.id }
    if (!b) add({ area: 'bom', kind: 'added', ...at, detail: '' })
    else
      for (const detail of bomChanges(d, b, stepOf))
        add({ area: 'bom', kind: 'changed', ...at, detail })
  }
  for (const b of bomPairs.removed)
    add({ area: 'bom', kind: 'removed', subject: `bill of materials, ${b.partNumber}`, detail: '' })
  return changes
}

/** One change as a line of text: `check l_primary: upper limit 135 → 140 µH`, `step 7 "Burn-in" added`. */
export function recipeChangeText(c: RecipeChange): string {
  if (c.kind === 'changed') return `${c.subject}: ${c.detail}`
  return `${c.subject} ${c.kind}${c.detail ? ` (${c.detail})` : ''}`
}
