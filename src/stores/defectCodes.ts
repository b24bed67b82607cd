import { defineStore } from 'pinia'
import { defectCodesApi } from '@/api/defectCodes'
import { useRecordList } from './lists/useRecordList'

export const useDefectCodesStore = defineStore('defectCodes', () => {
  /** Every defect code, sorted by code, with the list's flag and calls (`isLoading`, `fetchAll`, …). */
  const { rows: codes, ...list } = useRecordList(defectCodesApi, (c) => c.code)

  return { codes, ...list }
})
