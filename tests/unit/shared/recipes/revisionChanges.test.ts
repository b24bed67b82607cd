import { describe, expect, it } from 'vitest'
import {
  recipeChangeText,
  summarizeRecipeChanges,
} from '../../../../shared/recipes/revisionChanges'
import type { RecipeContent } from '../../../../shared/recipes/revisionChanges'
import type { BomLineDto, CheckDto, StepDto, WindingDto } from '../../../../shared/schemas/recipes'
import { checkDto } from '../../support/checkDto'

// Pairing and wording rules are ours: common practice, no source.

const check = (id: string, key: string, over: Partial<CheckDto> = {}): CheckDto =>
  checkDto({ id, key, label: key, unit: 'mH', nominal: 10, lower: 9, upper: 11, ...over })
const step = (id: string, position: number, name: string, checks: CheckDto[] = []): StepDto => ({
  id,
  position,
  name,
  stationKind: 'winding',
  instructions: '',
  safetyNote: '',
  requiresSignoff: false,
  checks,
})
const winding = (id: string, name: string, nominalTurns = 6): WindingDto => ({
  id,
  position: 1,
  name,
  nominalTurns,
  alNanoHenry: 3000,
  alTolerancePercent: 25,
  coreAreaMm2: null,
})
const line = (
  id: string,
  partNumber: string,
  fittedAtStepId: string | null,
  quantity = 1,
): BomLineDto => ({
  id,
  partId: `p-${partNumber}`,
  partNumber,
  partDescription: partNumber,
  unitOfMeasure: 'pcs',
  quantity,
  refDesignators: 'C1',
  fittedAtStepId,
  traceLevel: 'lot',
})

/**
 * One revision's content with every id carrying `tag` (`ca1`, `cb1`…), so two tags give a base
 * revision and its copy with every id changed, as `copyRecipe` makes them.
 */
function content(tag: string): RecipeContent {
  return {
    windings: [winding(`w${tag}`, 'Primary')],
    steps: [
      step(`s${tag}1`, 1, 'Winding', [
        check(`c${tag}1`, 'l_pri'),
        check(`c${tag}2`, 'turns_est', {
          derived: 'turns_from_inductance',
          derivedInputs: { winding: `w${tag}`, inductance: 'l_pri' },
          unit: 'turns',
        }),
      ]),
      step(`s${tag}2`, 2, 'Hipot', [
        check(`c${tag}3`, 'leak', { unit: 'mA', nominal: null, lower: null, upper: 5 }),
      ]),
    ],
    bom: [line(`b${tag}1`, 'CORE-1', `s${tag}1`)],
  }
}

/** A base revision (ids `…a…`) and its copy (ids `…b…`). */
function pair(): { base: RecipeContent; draft: RecipeContent } {
  return { base: content('a'), draft: content('b') }
}

describe('summarizeRecipeChanges', () => {
  it('finds nothing in an untouched copy, although every id differs', () => {
    const { base, draft } = pair()
    expect(summarizeRecipeChanges(base, draft)).toEqual([])
  })

  it('names a changed limit with the old and new value and the check to link to', () => {
    const { base, draft } = pair()
    draft.steps[0]!.checks[0]!.upper = 11.5
    const changes = summarizeRecipeChanges(base, draft)
    expect(changes).toEqual([
      {
        area: 'limits',
        kind: 'changed',
        subject: 'check l_pri',
        detail: 'upper limit 11 mH → 11.5 mH',
        stepId: 'sb1',
        checkId: 'cb1',
        bomLineId: null,
      },
    ])
    expect(recipeChangeText(changes[0]!)).toBe('check l_pri: upper limit 11 mH → 11.5 mH')
  })

  it('compares formulas through winding names, so a copied winding id is no change', () => {
    const { base, draft } = pair()
    draft.windings.push(winding('wc', 'Secondary', 92))
    draft.steps[0]!.checks[1]!.derivedInputs = { winding: 'wc', inductance: 'l_pri' }
    const changes = summarizeRecipeChanges(base, draft)
    expect(changes.map(recipeChangeText)).toEqual([
      'check turns_est: formula turns_from_inductance(inductance=l_pri, winding=Primary) → turns_from_inductance(inductance=l_pri, winding=Secondary)',
      'winding Secondary added',
    ])
    expect(changes[0]!.area).toBe('formula')
  })

  it('lists added, removed, renamed and moved steps and checks', () => {
    const { base, draft } = pair()
    draft.steps[1]!.name = 'Hipot 1.5 kV'
    draft.steps.push(step('sb3', 3, 'Burn-in', [check('cb4', 'temp', { unit: '°C' })]))
    draft.steps[0]!.checks.splice(0, 1)
    const moved = draft.steps[1]!.checks.pop()!
    draft.steps[2]!.checks.push(moved)
    expect(summarizeRecipeChanges(base, draft).map(recipeChangeText)).toEqual([
      'step 2 "Hipot 1.5 kV": renamed from "Hipot"',
      'step 3 "Burn-in" added',
      'check temp added (on step 3 "Burn-in")',
      'check leak: moved from step 2 "Hipot" to step 3 "Burn-in"',
      'check l_pri removed (was on step 1 "Winding")',
    ])
  })

  it('pairs a reordered step by name and says where it came from', () => {
    const { base, draft } = pair()
    draft.steps.reverse().forEach((s, i) => (s.position = i + 1))
    draft.steps[0]!.stationKind = 'hipot'
    expect(summarizeRecipeChanges(base, draft).map(recipeChangeText)).toEqual([
      'step 1 "Hipot": moved from position 2',
      'step 1 "Hipot": station kind winding → hipot',
      'step 2 "Winding": moved from position 1',
    ])
  })

  it('reports bill-of-materials quantity, fitted step and added or removed parts', () => {
    const { base, draft } = pair()
    draft.bom[0]!.quantity = 2
    draft.bom[0]!.fittedAtStepId = 'sb2'
    draft.bom.push(line('bb2', 'WIRE-2', null))
    base.bom.push(line('ba3', 'TAPE-9', 'sa1'))
    const changes = summarizeRecipeChanges(base, draft)
    expect(changes.map(recipeChangeText)).toEqual([
      'bill of materials, CORE-1: quantity 1 pcs → 2 pcs',
      'bill of materials, CORE-1: fitted at "Winding" → "Hipot"',
      'bill of materials, WIRE-2 added',
      'bill of materials, TAPE-9 removed',
    ])
    expect(changes[0]!.bomLineId).toBe('bb1')
    expect(changes[3]!.bomLineId).toBeNull()
  })

  it('reports a winding turn change and a check made boolean', () => {
    const { base, draft } = pair()
    draft.windings[0]!.nominalTurns = 7
    draft.steps[1]!.checks[0] = check('cb3', 'leak', {
      kind: 'boolean',
      unit: null,
      nominal: null,
      lower: null,
      upper: null,
    })
    expect(summarizeRecipeChanges(base, draft).map(recipeChangeText)).toEqual([
      'check leak: upper limit 5 mA → none',
      'check leak: kind numeric → boolean',
      'check leak: unit mA → none',
      'winding Primary: turns 6 → 7',
    ])
  })
})
