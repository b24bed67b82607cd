import { defineStore } from 'pinia'
import { defectCodesApi } from '@/api/defectCodes'
import { useRecordList } from './lists/useRecordList'

export const useDefectCodesStore = defineStore('defectCodes', () => {
  /** Every defect code, sorted by code; `isLoading` while they are fetched. */
  const {
    rows: codes,
    isLoading,
    fetchAll,
    create,
    update,
  } = useRecordList(defectCodesApi, (c) => c.code)

  return { codes, isLoading, fetchAll, create, update }
})
