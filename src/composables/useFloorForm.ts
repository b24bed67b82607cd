import { computed, reactive, ref, watch } from 'vue'
import type { Ref } from 'vue'
import { codeFromScan } from '@shared/links'
import { judgeStepRun } from '@shared/floor/decideStepRun'
import { typedValueProblem } from '@shared/floor/typedValues'
import type { CheckValue } from '@shared/recipes/evaluate'
import type {
  CountersignInput,
  FloorComponentLotDto,
  FloorUnitDto,
  StepRunInput,
} from '@shared/schemas/lots'
import type { CheckDto } from '@shared/schemas/recipes'
import { parseTypedNumber } from './formatCheck'
import { useMaterialScans } from './useMaterialScans'

export type { MaterialEntry } from './useMaterialScans'

/** What a check's control holds: typed text (numbers, words), yes/no, or the chosen option. */
export type CheckEntry = string | boolean | null

/** What stops a submit, and where to put the operator. */
export interface FormProblem {
  fieldId: string
  message: string
}

export const checkFieldId = (key: string) => `check:${key}`
export const lotFieldId = (lineId: string) => `lot:${lineId}`
export const itemFieldId = (lineId: string) => `item:${lineId}`

/**
 * A v4 UUID. `crypto.randomUUID` exists only on https or localhost pages, and a bench tablet
 * may open Waymark over plain http on the shop's network; getRandomValues works on both.
 */
export function newEventId(): string {
  if (typeof crypto.randomUUID === 'function') return crypto.randomUUID()
  const b = crypto.getRandomValues(new Uint8Array(16))
  b[6] = (b[6]! & 0x0f) | 0x40
  b[8] = (b[8]! & 0x3f) | 0x80
  const hex = [...b].map((x) => x.toString(16).padStart(2, '0')).join('')
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`
}

function valueOf(check: CheckDto, entry: CheckEntry | undefined): CheckValue {
  if (entry === undefined || entry === null) return null
  if (check.kind === 'numeric') return typeof entry === 'string' ? parseTypedNumber(entry) : null
  if (check.kind === 'text')
    return typeof entry === 'string' && entry.trim() !== '' ? entry.trim() : null
  return entry
}

/**
 * The Floor's entry form for one scanned unit: the typed readings judged live by the same
 * `judgeStepRun` the server's scan decision runs, the scanned component lots checked against
 * their BOM lines, the field order for Enter, and the step-run input to send.
 * @param lookup asks the server whether a lot may be fitted on a line
 */
export function useFloorForm(
  unit: Ref<FloorUnitDto | null>,
  lookup: (code: string, bomLineId: string) => Promise<FloorComponentLotDto>,
) {
  const entries = reactive<Record<string, CheckEntry>>({})
  /** Field id to the server's message from the last refusal. */
  const serverErrors = ref<Record<string, string>>({})
  /** Made once per scanned unit and sent again on every retry, so a run is never stored twice. */
  const clientEventId = ref(newEventId())
  const scans = useMaterialScans(lookup, (lineId) => {
    delete serverErrors.value[lotFieldId(lineId)]
    delete serverErrors.value[itemFieldId(lineId)]
  })
  const materials = scans.materials

  const checks = computed(() =>
    [...(unit.value?.step?.checks ?? [])].sort((a, b) => a.position - b.position),
  )
  const inputChecks = computed(() => checks.value.filter((c) => !c.derived))
  const values = computed(() =>
    Object.fromEntries(inputChecks.value.map((c) => [c.key, valueOf(c, entries[c.key])])),
  )
  /** Every check judged as the scan will judge it, derived ones computed from the typed values. */
  const judged = computed(() =>
    judgeStepRun({ checks: checks.value, windings: unit.value?.windings ?? [] }, values.value),
  )
  const results = computed(() => judged.value.results)
  const verdict = computed(() => judged.value.verdict)
  const failedChecks = computed(() =>
    checks.value.filter((c) => results.value[c.key]?.verdict === 'fail'),
  )
  const isDirty = computed(
    () =>
      Object.values(entries).some((e) => e !== null && e !== '') ||
      materials.value.some((m) => m.scanned !== ''),
  )

  /** Every field in the order Enter and Tab walk them. */
  const fieldIds = computed(() => [
    ...inputChecks.value.map((c) => checkFieldId(c.key)),
    ...materials.value.flatMap((m) =>
      m.line.traceLevel === 'serial'
        ? [lotFieldId(m.line.id), itemFieldId(m.line.id)]
        : [lotFieldId(m.line.id)],
    ),
  ])

  /** Starts over for a newly scanned unit: empty fields and a fresh event id. */
  function reset() {
    for (const key of Object.keys(entries)) delete entries[key]
    for (const c of inputChecks.value)
      entries[c.key] = c.kind === 'numeric' || c.kind === 'text' ? '' : null
    scans.reset(unit.value?.bom ?? [])
    serverErrors.value = {}
    clientEventId.value = newEventId()
  }
  watch(unit, reset, { immediate: true })

  function setEntry(key: string, entry: CheckEntry) {
    entries[key] = entry
    delete serverErrors.value[checkFieldId(key)]
  }

  /** The first thing missing or refused, in field order; waits for lot checks in flight. */
  async function firstProblem(): Promise<FormProblem | null> {
    await scans.settle()
    for (const c of inputChecks.value) {
      // The scan's own typed-value check; the form reads entries so that only absence is left.
      if (typedValueProblem(c, values.value[c.key]) !== null)
        return {
          fieldId: checkFieldId(c.key),
          message: `${c.label}: ${c.kind === 'numeric' ? 'type the reading' : 'answer it'}`,
        }
    }
    for (const m of materials.value) {
      const what = `${m.line.partNumber} (${m.line.partDescription})`
      if (m.status === 'empty')
        return { fieldId: lotFieldId(m.line.id), message: `Scan the lot label of ${what}` }
      if (m.status === 'refused') return { fieldId: lotFieldId(m.line.id), message: m.message }
      if (m.line.traceLevel === 'serial' && !m.itemSerial.trim())
        return {
          fieldId: itemFieldId(m.line.id),
          message: `Scan the serial of the ${m.line.partNumber} fitted`,
        }
    }
    return null
  }

  /** The step-run input for the server, from what is on screen. */
  function toInput(extra: {
    serial: string
    stationCode: string
    defectCodeId: string | null
    note: string
    countersign: CountersignInput | null
  }): StepRunInput {
    return {
      clientEventId: clientEventId.value,
      ...extra,
      values: values.value,
      consumptions: materials.value
        .filter((m) => codeFromScan(m.scanned))
        .map((m) => ({
          bomLineId: m.line.id,
          code: codeFromScan(m.scanned),
          ...(m.line.traceLevel === 'serial'
            ? { itemSerial: m.itemSerial.trim().toUpperCase() }
            : {}),
        })),
    }
  }

  /**
   * Puts a refusal's field messages on the fields they name: `values.<key>` and
   * `consumptions.<bomLineId>` (or `consumptions.<n>.code|itemSerial` by position).
   * @returns the messages naming no field on screen, e.g. `countersign`
   */
  function applyServerErrors(fields: Record<string, string>): { field: string; message: string }[] {
    const sent = materials.value.filter((m) => codeFromScan(m.scanned))
    const mapped: Record<string, string> = {}
    const rest: { field: string; message: string }[] = []
    for (const [field, message] of Object.entries(fields)) {
      const value = /^values\.(.+)$/.exec(field)
      const consumption = /^consumptions\.([^.]+)(?:\.(code|itemSerial|bomLineId))?$/.exec(field)
      const ref = consumption?.[1] ?? ''
      const line = /^\d+$/.test(ref)
        ? sent[Number(ref)]?.line
        : materials.value.find((m) => m.line.id === ref)?.line
      if (value && inputChecks.value.some((c) => c.key === value[1]))
        mapped[checkFieldId(value[1]!)] = message
      else if (line) {
        const m = scans.find(line.id)!
        const isItem =
          consumption![2] === 'itemSerial' ||
          (line.traceLevel === 'serial' &&
            codeFromScan(m.scanned) !== '' &&
            /serial/i.test(message))
        mapped[isItem ? itemFieldId(line.id) : lotFieldId(line.id)] = message
      } else rest.push({ field, message })
    }
    serverErrors.value = mapped
    return rest
  }

  return {
    entries,
    materials,
    serverErrors,
    clientEventId,
    checks,
    inputChecks,
    results,
    verdict,
    failedChecks,
    isDirty,
    fieldIds,
    reset,
    setEntry,
    setScanned: scans.setScanned,
    setItemSerial: scans.setItemSerial,
    verifyMaterial: scans.verify,
    fillNextMaterial: scans.fillNext,
    firstProblem,
    toInput,
    applyServerErrors,
  }
}
