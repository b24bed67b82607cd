import { defineStore } from 'pinia'
import { ref } from 'vue'
import type {
  ContainedUnitDecisionInput,
  ContainResultDto,
  EndContainmentInput,
  EndContainmentResultDto,
  RecallScopeDto,
  UnitTraceDto,
} from '@shared/schemas/trace'
import { ApiError } from '@/api/client'
import { traceApi } from '@/api/trace'

/** A lookup that did not find a unit: what was asked, what the server said, what it offers. */
export interface TraceMiss {
  asked: string
  code: string
  message: string
  suggestions: string[]
}

function missOf(asked: string, error: unknown): TraceMiss | null {
  if (!(error instanceof ApiError) || (error.status !== 422 && error.status !== 404)) return null
  const details = Array.isArray(error.details) ? {} : error.details
  const suggestions = Array.isArray(details.suggestions) ? (details.suggestions as string[]) : []
  return { asked, code: error.code, message: error.message, suggestions }
}

export const useTraceStore = defineStore('trace', () => {
  /** The unit on screen. */
  const trace = ref<UnitTraceDto | null>(null)
  /** The last serial lookup that found nothing (mistyped or unknown), with suggestions. */
  const miss = ref<TraceMiss | null>(null)
  const isLoading = ref(false)
  /** The recall scope on screen. */
  const scope = ref<RecallScopeDto | null>(null)
  const scopeMiss = ref<TraceMiss | null>(null)
  const isScopeLoading = ref(false)
  /** What the last containment did. */
  const contained = ref<ContainResultDto | null>(null)
  /** What the last end of a containment did. */
  const ended = ref<EndContainmentResultDto | null>(null)

  /** Looks a serial up; a mistyped or unknown one lands in `miss`, other errors are thrown. */
  async function lookUp(serial: string) {
    isLoading.value = true
    miss.value = null
    try {
      trace.value = await traceApi.unit(serial)
    } catch (error) {
      const m = missOf(serial, error)
      if (!m) throw error
      trace.value = null
      miss.value = m
    } finally {
      isLoading.value = false
    }
  }

  /** Loads the recall scope of a component lot; an unknown code lands in `scopeMiss`. */
  async function lookUpLot(code: string) {
    isScopeLoading.value = true
    scopeMiss.value = null
    contained.value = null
    ended.value = null
    try {
      scope.value = await traceApi.recall(code)
    } catch (error) {
      const m = missOf(code, error)
      if (!m) throw error
      scope.value = null
      scopeMiss.value = m
    } finally {
      isScopeLoading.value = false
    }
  }

  /** Lead: contains the lot on screen; throws ApiError. */
  async function contain(reason: string) {
    if (!scope.value) return
    const result = await traceApi.contain(scope.value.componentLot.internalCode, reason)
    contained.value = result
    ended.value = null
    scope.value = result.scope
  }

  /** Lead: ends the containment of the lot on screen; throws ApiError. */
  async function endContainment(input: EndContainmentInput) {
    if (!scope.value) return
    const result = await traceApi.endContainment(scope.value.componentLot.internalCode, input)
    ended.value = result
    contained.value = null
    scope.value = result.scope
  }

  /** Lead or engineer: decides one held unit of a rejected lot, then reloads the scope. */
  async function decideContainedUnit(serial: string, input: ContainedUnitDecisionInput) {
    if (!scope.value) return
    const unit = await traceApi.decideContainedUnit(serial, input)
    scope.value = await traceApi.recall(scope.value.componentLot.internalCode)
    return unit
  }

  return {
    trace,
    miss,
    isLoading,
    scope,
    scopeMiss,
    isScopeLoading,
    contained,
    ended,
    lookUp,
    lookUpLot,
    contain,
    endContainment,
    decideContainedUnit,
  }
})
