import { defineStore } from 'pinia'
import { reactive } from 'vue'
import { auditApi } from '@/api/audit'
import { usePagedList } from './lists/usePagedList'

/** The filters of the audit screen; empty strings mean "any". */
export interface AuditFilters {
  entity: string
  action: string
  actor: string
}

export const useAuditStore = defineStore('audit', () => {
  const filters = reactive<AuditFilters>({ entity: '', action: '', actor: '' })

  const { rows, total, page, pageSize, isLoading, loadError, fetchPage, search } = usePagedList(
    (paging) =>
      auditApi.list({
        ...paging,
        entity: filters.entity.trim(),
        action: filters.action.trim(),
        actor: filters.actor.trim(),
      }),
    50,
  )

  return { rows, total, page, pageSize, filters, isLoading, loadError, fetchPage, search }
})
