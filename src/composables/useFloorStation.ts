import { nextTick, ref } from 'vue'
import { storeToRefs } from 'pinia'
import { codeFromScan, isBadgeCode, looksLikeComponentLotCode } from '@shared/links'
import type { CountersignInput } from '@shared/schemas/lots'
import { looksLikeSerial } from '@shared/serials'
import { ApiError, messageOf } from '@/api/client'
import { toSentence } from './format'
import { useFloorStore } from '@/stores/floor'
import { checkFieldId, useFloorForm } from './useFloorForm'

/** How a notice reads: a refusal or error asks for action, pass and fail confirm a record. */
export type NoticeTone = 'info' | 'refusal' | 'error' | 'pass' | 'fail'

export interface FloorNotice {
  tone: NoticeTone
  title: string
  message: string
}

/** What the station screen asks of the person, through its dialogs and fields. */
export interface FloorPrompts {
  focusScan(): void
  focusField(fieldId: string): void
  askDefect(): Promise<{ defectCodeId: string | null; note: string } | null>
  askCountersign(): Promise<CountersignInput | null>
  /** Asks before unsaved readings are dropped for another unit. */
  confirmSwitch(from: string, to: string): Promise<boolean>
}

/** How the fields a refusal names, but the screen has no input for, are introduced. */
const OFF_SCREEN_FIELDS: Record<string, string> = {
  countersign: 'Second person: ',
  defectCodeId: 'Defect code: ',
}

const LOOKUP_TITLES: Record<string, string> = {
  unknown_serial: 'No unit has that serial',
  mistyped_serial: 'That serial has a typing mistake',
  network_error: 'Waymark cannot reach the server',
}

/**
 * The station screen's flow: a scan opens a unit (or says why it cannot be worked here), lot
 * labels go to the next empty BOM line, and a submit walks through what is missing, the
 * defect code of a fail and the second person's signature before the run is sent.
 */
export function useFloorStation(prompts: FloorPrompts) {
  const floor = useFloorStore()
  const { workable } = storeToRefs(floor)
  const form = useFloorForm(workable, floor.checkComponentLot)
  /** The big message while no unit is open: a refusal, an error, or the last record. */
  const notice = ref<FloorNotice | null>(null)
  /** A refusal of the open unit's record, shown beside the Record button. */
  const formNotice = ref<FloorNotice | null>(null)

  function nextField(fieldId: string) {
    const ids = form.fieldIds.value
    const at = ids.indexOf(fieldId)
    if (at === ids.length - 1) return void submit()
    prompts.focusField(ids[at + 1] ?? ids[0]!)
  }

  async function scan(raw: string) {
    const code = codeFromScan(raw)
    if (!code) return
    const isLotLabel = /\/c\/[^/]+\/?$/i.test(raw.trim())
    const open = workable.value
    if (isBadgeCode(code)) {
      // Beside the Record button while a unit is open, as the big message otherwise.
      ;(open ? formNotice : notice).value = {
        tone: 'refusal',
        title: 'That is a person’s badge',
        message:
          'A badge signs as the second person when a step asks for one. It is read in the signature box, not here.',
      }
      return prompts.focusScan()
    }
    if (open && (isLotLabel || !looksLikeSerial(code))) {
      const lineId = form.fillNextMaterial(code)
      if (lineId) return nextField(`lot:${lineId}`)
    }
    // Something that is not a traveler, scanned with no unit open: say what it is.
    if (!open && (isLotLabel || looksLikeComponentLotCode(code))) {
      notice.value = {
        tone: 'refusal',
        title: `That is component lot ${code}`,
        message: 'Scan a traveler first, then the lot labels of its step.',
      }
      return prompts.focusScan()
    }
    if (open && code === open.unit.serial)
      return prompts.focusField(form.fieldIds.value[0] ?? 'scan')
    if (open && form.isDirty.value && !(await prompts.confirmSwitch(open.unit.serial, code))) return
    notice.value = null
    formNotice.value = null
    try {
      const found = await floor.scan(code)
      if (found.refusal || !found.step) {
        const reason = found.unit.holdReason
        const hold = reason && !found.refusal?.includes(reason) ? `Hold: ${reason}` : ''
        notice.value = {
          tone: 'refusal',
          title: toSentence(found.refusal ?? `${found.unit.serial} has nothing to do here`),
          message: hold,
        }
        return prompts.focusScan()
      }
      await nextTick()
      prompts.focusField(form.fieldIds.value[0] ?? 'scan')
    } catch (error) {
      floor.clearUnit()
      const key = error instanceof ApiError ? error.code : ''
      notice.value = {
        tone: 'error',
        title: LOOKUP_TITLES[key] ?? 'The scan could not be looked up',
        message: messageOf(error),
      }
      prompts.focusScan()
    }
  }

  async function submit() {
    const open = workable.value
    if (!open?.step || floor.isRecording) return
    formNotice.value = null
    const problem = await form.firstProblem()
    if (problem) {
      formNotice.value = { tone: 'refusal', title: problem.message, message: '' }
      return prompts.focusField(problem.fieldId)
    }
    const firstFailed = form.failedChecks.value.find((c) => !c.derived)
    const backToReadings = () =>
      prompts.focusField(
        firstFailed ? checkFieldId(firstFailed.key) : (form.fieldIds.value[0] ?? 'scan'),
      )
    const defect =
      form.verdict.value === 'fail' ? await prompts.askDefect() : { defectCodeId: null, note: '' }
    if (!defect) return void setTimeout(backToReadings)
    const countersign = open.step.requiresSignoff ? await prompts.askCountersign() : null
    if (open.step.requiresSignoff && !countersign)
      return void setTimeout(() => prompts.focusField(form.fieldIds.value.at(-1)!))
    try {
      const input = form.toInput({
        serial: open.unit.serial,
        stationCode: floor.stationCode,
        ...defect,
        countersign,
      })
      const { stepRun, unit } = await floor.record(input)
      const next = unit.currentStep ? `Next: ${unit.currentStep.name}.` : 'Its route is complete.'
      notice.value =
        stepRun.result === 'pass'
          ? {
              tone: 'pass',
              title: `PASS · ${unit.serial}`,
              message: `${open.step.name} recorded${stepRun.attempt > 1 ? ` (try ${stepRun.attempt})` : ''}. ${next}`,
            }
          : {
              tone: 'fail',
              title: `FAIL · ${unit.serial} is on hold`,
              message:
                'Put it on the hold shelf with its traveler; the lead decides on rework, scrap or use as is.',
            }
      prompts.focusScan()
    } catch (error) {
      showRefusal(error)
    }
  }

  /** Marks the fields a refusal names and says what to do; nothing was recorded. */
  function showRefusal(error: unknown) {
    const api = error instanceof ApiError ? error : null
    const rest = form.applyServerErrors(api?.fields ?? {})
    const marked = form.fieldIds.value.find((id) => form.serverErrors.value[id])
    const others = rest
      .map((r) => `${OFF_SCREEN_FIELDS[r.field] ?? ''}${toSentence(r.message)}.`)
      .join(' ')
    if (api?.status === 0)
      formNotice.value = {
        tone: 'error',
        title: 'Not recorded: no connection',
        message:
          'Press Record again when the network is back; the same record is sent, never twice.',
      }
    else if (api?.status === 400 && (marked || others))
      formNotice.value = {
        tone: 'error',
        title: marked ? 'Not recorded: see the marked fields' : `Not recorded. ${others}`,
        message: marked ? others : '',
      }
    else
      formNotice.value = {
        tone: 'error',
        title: messageOf(error),
        message: 'Nothing was recorded.',
      }
    prompts.focusField(marked ?? form.fieldIds.value.at(-1) ?? 'scan')
  }

  return { floor, form, notice, formNotice, scan, submit, nextField }
}
