import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { DefectCodeDto, DefectCodeInput } from '@shared/schemas/recipes'
import { defectCodesApi } from '@/api/defectCodes'

export const useDefectCodesStore = defineStore('defectCodes', () => {
  /** Every defect code, sorted by code. */
  const codes = ref<DefectCodeDto[]>([])
  /** True while the list is being fetched. */
  const isLoading = ref(false)

  function put(code: DefectCodeDto) {
    const rest = codes.value.filter((c) => c.id !== code.id)
    codes.value = [...rest, code].sort((a, b) => a.code.localeCompare(b.code))
  }

  /** Fetches every code; throws ApiError. */
  async function fetchAll() {
    isLoading.value = true
    try {
      codes.value = (await defectCodesApi.list()).sort((a, b) => a.code.localeCompare(b.code))
    } finally {
      isLoading.value = false
    }
  }

  /** Creates a code and keeps it in the list. */
  async function create(input: DefectCodeInput) {
    const code = await defectCodesApi.create(input)
    put(code)
    return code
  }

  /** Updates a code and replaces it in the list. */
  async function update(id: string, input: Partial<DefectCodeInput>) {
    const code = await defectCodesApi.update(id, input)
    put(code)
    return code
  }

  return { codes, isLoading, fetchAll, create, update }
})
