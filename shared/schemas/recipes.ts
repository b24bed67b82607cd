import { z } from 'zod'
import { patchSchema, text } from './common'
import {
  CHECK_KINDS,
  DERIVED_FORMULA_KEYS,
  INSULATION_CLASSES,
  REVISION_STATUSES,
  TRACE_LEVELS,
  UNITS_OF_MEASURE,
} from '../recipeDefinitions'
import type {
  CheckKind,
  DerivedFormula,
  InsulationClass,
  RevisionStatus,
  TraceLevel,
  UnitOfMeasure,
} from '../recipeDefinitions'
import { checkLimitProblems } from '../checkRules'
import { STATION_KINDS } from '../stations'
import type { StationKind } from '../stations'
import { UNIT_SYMBOLS } from '../units'
import type { Unit } from '../units'

const requiredText = (max: number, what = 'this') => text().trim().min(1, `enter ${what}`).max(max)
const optionalText = (max: number) => text().trim().max(max).default('')
const limit = z.number({ error: 'enter a number' }).finite().nullable()

export const ProductCreateInput = z.object({
  code: text()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9]{2,6}$/, 'use 2 to 6 letters or digits (it starts every serial)'),
  name: requiredText(80, 'a name'),
  description: optionalText(2000),
})
export type ProductCreateInput = z.infer<typeof ProductCreateInput>
export const ProductUpdateInput = patchSchema(ProductCreateInput.omit({ code: true }))
export type ProductUpdateInput = z.infer<typeof ProductUpdateInput>

export const RevisionUpdateInput = patchSchema(
  z.object({
    notes: optionalText(4000),
    fpyThresholdPercent: z.number().min(0, 'use 0 to 100 %').max(100, 'use 0 to 100 %'),
    /** The highest RMS voltage across the insulation the hipot step tests, in volts. */
    workingVolts: z
      .number({ error: 'enter a voltage in volts' })
      .positive('the working voltage must be more than 0 V')
      .max(100000, 'at most 100 000 V')
      .nullable(),
    insulation: z.enum(INSULATION_CLASSES, { error: 'choose basic or reinforced' }),
  }),
)
export type RevisionUpdateInput = z.infer<typeof RevisionUpdateInput>

/** What becomes of the product's released revisions when a draft is released. */
export const RELEASE_PREVIOUS = ['obsolete', 'keep'] as const
export const ReleaseInput = z.object({
  previous: z
    .enum(RELEASE_PREVIOUS, { error: 'choose obsolete or keep for the released revision' })
    .default('obsolete'),
})
export type ReleaseInput = z.infer<typeof ReleaseInput>

export const WindingInput = z.object({
  name: requiredText(40, 'a winding name'),
  nominalTurns: z.number().int('whole turns only').min(1, 'at least 1 turn').max(100000),
  alNanoHenry: z.number().positive('AL must be positive').max(1e6),
  alTolerancePercent: z.number().min(0).max(100).default(25),
  coreAreaMm2: z.number().positive('core area must be positive').max(1e6).nullable().default(null),
})
export type WindingInput = z.infer<typeof WindingInput>
export const WindingUpdateInput = patchSchema(WindingInput)

export const StepInput = z.object({
  name: requiredText(80, 'a step name'),
  stationKind: z.enum(STATION_KINDS, { error: 'choose a station kind' }),
  instructions: optionalText(8000),
  safetyNote: optionalText(2000),
  requiresSignoff: z.boolean().default(false),
})
export type StepInput = z.infer<typeof StepInput>
export const StepUpdateInput = patchSchema(StepInput).extend({
  position: z.number().int().min(1).optional(),
})
export type StepUpdateInput = z.infer<typeof StepUpdateInput>

export const StepOrderInput = z.object({
  stepIds: z.array(text().uuid()).min(1, 'list every step'),
})

export const ChoiceOption = z.object({ value: requiredText(60, 'a choice'), isPass: z.boolean() })
export type ChoiceOption = z.infer<typeof ChoiceOption>

const checkFields = {
  key: text()
    .trim()
    .regex(/^[a-z][a-z0-9_]{0,39}$/, 'use lower-case letters, digits and _ (start with a letter)'),
  label: requiredText(120, 'a label'),
  kind: z.enum(CHECK_KINDS, { error: 'choose a kind' }),
  unit: z
    .enum(UNIT_SYMBOLS as [Unit, ...Unit[]], { error: 'choose a unit from the list' })
    .nullable()
    .default(null),
  nominal: limit.default(null),
  lower: limit.default(null),
  upper: limit.default(null),
  decimals: z.number().int().min(0).max(6).default(2),
  choices: z.array(ChoiceOption).max(20).nullable().default(null),
  derived: z
    .enum(DERIVED_FORMULA_KEYS as [DerivedFormula, ...DerivedFormula[]])
    .nullable()
    .default(null),
  derivedInputs: z.record(text(), text()).nullable().default(null),
  isKey: z.boolean().optional(),
  /** Left out: on, except for turn counts (see `isForCustomersByDefault`). */
  isForCustomers: z.boolean().optional(),
}

/** The flags that steer documents only; a released revision's checks may still change them. */
export const CHECK_DOCUMENT_FLAGS = ['isKey', 'isForCustomers'] as const

const TURN_FORMULAS: readonly (DerivedFormula | null)[] = [
  'turns_from_inductance',
  'turn_deviation',
  'secondary_turns_from_ratio',
]

/** A check goes on the certificate unless it counts turns: how the shop winds is internal. */
export function isForCustomersByDefault(c: {
  unit: Unit | null
  derived: DerivedFormula | null
}): boolean {
  return c.unit !== 'turns' && !TURN_FORMULAS.includes(c.derived)
}

/** A check as created; limits are cross-checked by the same rule the update uses. */
export const CheckInput = z.object(checkFields).superRefine((c, ctx) => {
  for (const p of checkLimitProblems(c))
    ctx.addIssue({ code: 'custom', path: [p.field], message: p.message })
})
export type CheckInput = z.infer<typeof CheckInput>
export const CheckUpdateInput = patchSchema(z.object(checkFields))
export type CheckUpdateInput = z.infer<typeof CheckUpdateInput>

export const PartInput = z.object({
  partNumber: text()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9._/-]{0,39}$/, 'use letters, digits and . _ / -'),
  description: requiredText(200, 'a description'),
  unitOfMeasure: z.enum(UNITS_OF_MEASURE, { error: 'choose a unit of measure' }).default('pcs'),
  hasExpiry: z.boolean().default(false),
  /** New lots wait quarantined until stores accept them at incoming inspection. */
  // Optional rather than defaulted, so callers written before these flags still type-check.
  needsInspection: z.boolean().optional(),
  /** Days a lot keeps from receipt, to suggest its expiry date; only for a part that ages. */
  shelfLifeDays: z
    .number()
    .int('a whole number of days')
    .min(1, 'at least 1 day')
    .max(36500, 'at most 36500 days')
    .nullable()
    .optional(),
})
export type PartInput = z.infer<typeof PartInput>
export const PartUpdateInput = patchSchema(PartInput)

export const BomLineInput = z.object({
  partId: text().uuid('choose a part'),
  quantity: z.number().positive('quantity must be more than 0').max(100000),
  refDesignators: optionalText(400),
  fittedAtStepId: text().uuid().nullable().default(null),
  traceLevel: z.enum(TRACE_LEVELS).default('lot'),
})
export type BomLineInput = z.infer<typeof BomLineInput>
export const BomLineUpdateInput = patchSchema(BomLineInput)

export const DefectCodeInput = z.object({
  code: text()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9-]{1,15}$/, 'use 2 to 16 letters, digits or -'),
  description: requiredText(200, 'a description'),
  stationKinds: z.array(z.enum(STATION_KINDS)).min(1, 'choose at least one station kind'),
  isActive: z.boolean().default(true),
})
export type DefectCodeInput = z.infer<typeof DefectCodeInput>
export const DefectCodeUpdateInput = patchSchema(DefectCodeInput)

// --- what the API returns ---------------------------------------------------------------

export interface WindingDto {
  id: string
  position: number
  name: string
  nominalTurns: number
  alNanoHenry: number
  alTolerancePercent: number
  coreAreaMm2: number | null
}

export interface CheckDto {
  id: string
  stepId: string
  position: number
  key: string
  label: string
  kind: CheckKind
  unit: Unit | null
  nominal: number | null
  lower: number | null
  upper: number | null
  decimals: number
  choices: ChoiceOption[] | null
  derived: DerivedFormula | null
  derivedInputs: Record<string, string> | null
  /** Its statistics go in the lot report (documents only; may change after release). */
  isKey: boolean
  /** Its results go on the customer's certificate (documents only; may change after release). */
  isForCustomers: boolean
}

export interface StepDto {
  id: string
  position: number
  name: string
  stationKind: StationKind
  instructions: string
  safetyNote: string
  requiresSignoff: boolean
  checks: CheckDto[]
}

export interface BomLineDto {
  id: string
  partId: string
  partNumber: string
  partDescription: string
  unitOfMeasure: UnitOfMeasure
  quantity: number
  refDesignators: string
  fittedAtStepId: string | null
  traceLevel: TraceLevel
}

export interface RevisionSummaryDto {
  id: string
  letter: string
  status: RevisionStatus
}

export interface RevisionDto extends RevisionSummaryDto {
  productId: string
  productCode: string
  productName: string
  notes: string
  fpyThresholdPercent: number
  /** Working voltage across the hipot-tested insulation, in volts; null when not given. */
  workingVolts: number | null
  insulation: InsulationClass
  /** The revision this one was copied from, for the change summary. */
  copiedFrom: { id: string; letter: string } | null
  releasedAt: string | null
  /** Name of the person who released it. */
  releasedBy: string | null
  createdAt: string
  windings: WindingDto[]
  steps: StepDto[]
  bom: BomLineDto[]
}

export interface ProductDto {
  id: string
  code: string
  name: string
  description: string
  revisions: RevisionSummaryDto[]
}

export interface PartDto {
  id: string
  partNumber: string
  description: string
  unitOfMeasure: UnitOfMeasure
  hasExpiry: boolean
  needsInspection: boolean
  shelfLifeDays: number | null
}

export interface DefectCodeDto {
  id: string
  code: string
  description: string
  stationKinds: StationKind[]
  isActive: boolean
}

export const RevisionStatusSchema = z.enum(REVISION_STATUSES)
