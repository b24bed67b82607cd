import { onScopeDispose, ref, watch } from 'vue'
import type { Ref } from 'vue'
import type { ReturnableUnitDto } from '@shared/schemas/shipping'
import { messageOf } from '@/api/client'
import { serviceCasesApi } from '@/api/serviceCases'

/** How long typing must pause before a serial is looked up (a scanner's burst is one pause). */
const PAUSE_MS = 300

/**
 * Looks up the serial being typed into the return dialog, so the person sees which unit,
 * product and customer the return is about before it is logged. Only the answer for the
 * serial still in the box is kept.
 */
export function useReturnableUnit(serial: Ref<string>) {
  const data = ref<ReturnableUnitDto | null>(null)
  const error = ref('')
  const isLoading = ref(false)
  let timer: ReturnType<typeof setTimeout> | undefined

  async function lookUp(asked: string) {
    isLoading.value = true
    try {
      const unit = await serviceCasesApi.returnable(asked)
      if (serial.value.trim() === asked) data.value = unit
    } catch (e) {
      if (serial.value.trim() === asked) error.value = messageOf(e)
    } finally {
      if (serial.value.trim() === asked) isLoading.value = false
    }
  }

  watch(serial, (text) => {
    clearTimeout(timer)
    data.value = null
    error.value = ''
    isLoading.value = false
    const asked = text.trim()
    if (asked) timer = setTimeout(() => void lookUp(asked), PAUSE_MS)
  })
  onScopeDispose(() => clearTimeout(timer))

  return { data, error, isLoading }
}
