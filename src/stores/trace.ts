import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { Ref } from 'vue'
import type {
  ContainedUnitDecisionInput,
  ContainResultDto,
  EndContainmentInput,
  EndContainmentResultDto,
  RecallScopeDto,
} from '@shared/schemas/trace'
import { ApiError } from '@/api/client'
import { traceApi } from '@/api/trace'
import { whileLoading } from './lists/whileLoading'

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

/**
 * A lookup by what the person typed: the record found, or the miss with its suggestions.
 * `lookUp` throws the errors that are not a miss (ApiError, network).
 */
function useLookup<T>(find: (asked: string) => Promise<T>) {
  const found = ref(null) as Ref<T | null>
  const miss = ref<TraceMiss | null>(null)
  const isLoading = ref(false)

  async function lookUp(asked: string) {
    miss.value = null
    await whileLoading(isLoading, async () => {
      try {
        found.value = await find(asked)
      } catch (error) {
        const m = missOf(asked, error)
        if (!m) throw error
        found.value = null
        miss.value = m
      }
    })
  }

  return { found, miss, isLoading, lookUp }
}

export const useTraceStore = defineStore('trace', () => {
  /** The unit on screen, or the last serial lookup that found nothing (mistyped or unknown). */
  const units = useLookup(traceApi.unit)
  /** The recall scope on screen, or the component lot code that found nothing. */
  const scopes = useLookup(traceApi.recall)
  const scope = scopes.found
  /** What the last containment did. */
  const contained = ref<ContainResultDto | null>(null)
  /** What the last end of a containment did. */
  const ended = ref<EndContainmentResultDto | null>(null)

  /** Loads the recall scope of a component lot; an unknown code lands in `scopeMiss`. */
  async function lookUpLot(code: string) {
    contained.value = null
    ended.value = null
    await scopes.lookUp(code)
  }

  /**
   * Runs a containment step on the lot on screen: shows the scope it answers with, keeps its
   * answer in `shown` and clears what the other step did.
   */
  async function stepOnLot<R extends { scope: RecallScopeDto }>(
    shown: Ref<R | null>,
    other: Ref<unknown>,
    call: (code: string) => Promise<R>,
  ) {
    if (!scope.value) return
    const result = await call(scope.value.componentLot.internalCode)
    shown.value = result
    other.value = null
    scope.value = result.scope
  }

  /** Lead: contains the lot on screen; throws ApiError. */
  const contain = (reason: string) =>
    stepOnLot(contained, ended, (code) => traceApi.contain(code, reason))
  /** Lead: ends the containment of the lot on screen; throws ApiError. */
  const endContainment = (input: EndContainmentInput) =>
    stepOnLot(ended, contained, (code) => traceApi.endContainment(code, input))

  /** Lead or engineer: decides one held unit of a rejected lot, then reloads the scope. */
  async function decideContainedUnit(serial: string, input: ContainedUnitDecisionInput) {
    if (!scope.value) return
    const unit = await traceApi.decideContainedUnit(serial, input)
    scope.value = await traceApi.recall(scope.value.componentLot.internalCode)
    return unit
  }

  return {
    /** The unit on screen. */
    trace: units.found,
    miss: units.miss,
    isLoading: units.isLoading,
    /** Looks a serial up; a mistyped or unknown one lands in `miss`, other errors are thrown. */
    lookUp: units.lookUp,
    scope,
    scopeMiss: scopes.miss,
    isScopeLoading: scopes.isLoading,
    contained,
    ended,
    lookUpLot,
    contain,
    endContainment,
    decideContainedUnit,
  }
})
