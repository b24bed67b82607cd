import { ref } from 'vue'
import { ElMessage, ElMessageBox } from 'element-plus'
import type { LabelLayoutKey } from '@shared/lots'
import { ReasonInput } from '@shared/schemas/lots'
import type { DispositionInput, NonconformanceDto } from '@shared/schemas/lots'
import { messageOf } from '@/api/client'
import { useLotsStore } from '@/stores/lots'
import { confirmAction } from './confirmAction'
import { toSentence } from './format'
import { useSubmit } from './useSubmit'

/** What the reason prompts of a hold and of its release ask. */
const HOLD_QUESTION =
  'Why is the lot held? Operators see this at every station when they scan one of its units.'
const UNHOLD_QUESTION = 'Why may work go on? The reason goes into the lot’s history.'

/** Asks for a reason in a message box, checked by the schema the server uses; null when cancelled. */
async function askReason(
  message: string,
  title: string,
  confirmButtonText: string,
): Promise<string | null> {
  try {
    const { value } = await ElMessageBox.prompt(message, title, {
      confirmButtonText,
      cancelButtonText: 'Cancel',
      inputType: 'textarea',
      inputValidator: (text: string) => {
        const parsed = ReasonInput.safeParse({ reason: text ?? '' })
        return parsed.success || toSentence(parsed.error.issues[0]?.message ?? 'say why')
      },
    })
    return ReasonInput.parse({ reason: value }).reason
  } catch {
    return null
  }
}

/**
 * The lead's actions on the open lot, each asking first where the step cannot be undone from
 * here, and reporting the result with a message.
 */
export function useLotActions() {
  const store = useLotsStore()
  const isBusy = ref(false)
  const disposal = useSubmit()

  async function run(action: () => Promise<unknown>, success: string) {
    isBusy.value = true
    try {
      await action()
      ElMessage.success(success)
    } catch (error) {
      ElMessage.error(messageOf(error))
    } finally {
      isBusy.value = false
    }
  }

  async function release() {
    const lot = store.lot
    if (!lot) return
    const text = `Releasing ${lot.number} allocates ${lot.quantity} serials and prints travelers and labels. A released lot can no longer be edited.`
    if (await confirmAction(text, `Release lot ${lot.number}?`, 'Release', false))
      await run(store.release, `Lot ${lot.number} released`)
  }

  /** Runs `action` with the reason the lead gives in a prompt; nothing when it is cancelled. */
  async function withReason(
    action: (reason: string) => Promise<unknown>,
    [message, title, button]: [string, string, string],
    success: string,
  ) {
    const reason = await askReason(message, title, button)
    if (reason) await run(() => action(reason), success)
  }

  const hold = () =>
    withReason(store.hold, [HOLD_QUESTION, 'Hold the lot', 'Hold lot'], 'Lot on hold')
  const unhold = () =>
    withReason(store.unhold, [UNHOLD_QUESTION, 'Release the hold', 'Release hold'], 'Hold released')

  async function close() {
    const lot = store.lot
    if (!lot) return
    if (
      await confirmAction(
        `Every unit of ${lot.number} has finished. Close the lot?`,
        'Close lot',
        'Close lot',
        false,
      )
    )
      await run(store.close, `Lot ${lot.number} closed`)
  }

  async function printLabels(layout: LabelLayoutKey) {
    await run(() => store.requestDocument({ kind: 'labels', layout }), 'Labels are being made')
  }

  async function reprintTravelers() {
    await run(() => store.requestDocument({ kind: 'travelers' }), 'Travelers are being made')
  }

  async function makeLotReport() {
    await run(() => store.requestDocument({ kind: 'lot_report' }), 'The lot report is being made')
  }

  /** Scrap is final and rework sends the unit back, so both are confirmed first. */
  async function dispose(nc: NonconformanceDto, input: DispositionInput): Promise<boolean> {
    if (input.disposition === 'scrap') {
      const isSure = await confirmAction(
        `Scrap ${nc.serial}? It leaves the lot for good; this cannot be undone.`,
        'Scrap unit',
        'Scrap',
      )
      if (!isSure) return false
    }
    if (input.disposition === 'rework') {
      const step = store.grid?.steps.find((s) => s.id === input.reworkToStepId)
      const isSure = await confirmAction(
        `Send ${nc.serial} back to ${step?.name ?? 'the chosen step'}? It is built and tested again from there.`,
        'Rework unit',
        'Send to rework',
        false,
      )
      if (!isSure) return false
    }
    const labels = {
      rework: 'sent to rework',
      scrap: 'scrapped',
      use_as_is: 'accepted as is',
    } as const
    return disposal.run(
      () => store.dispose(nc.id, input),
      `${nc.serial} ${labels[input.disposition]}`,
    )
  }

  return {
    isBusy,
    disposal,
    release,
    hold,
    unhold,
    close,
    printLabels,
    reprintTravelers,
    makeLotReport,
    dispose,
  }
}
