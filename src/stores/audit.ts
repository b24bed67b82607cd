import { defineStore } from 'pinia'
import { reactive } from 'vue'
import { auditApi } from '@/api/audit'
import type { AuditFilterQuery } from '@/api/audit'
import { usePagedList } from './lists/usePagedList'

/** The filters of the audit screen; empty strings mean "any". */
export interface AuditFilters {
  actorId: string
  entity: string
  thing: string
  /** First and last day (YYYY-MM-DD), or null for an open end. */
  from: string | null
  to: string | null
}

const EMPTY: AuditFilters = { actorId: '', entity: '', thing: '', from: null, to: null }

export const useAuditStore = defineStore('audit', () => {
  const filters = reactive<AuditFilters>({ ...EMPTY })

  /** The filters as the API takes them. */
  function query(): AuditFilterQuery {
    return {
      actorId: filters.actorId,
      entity: filters.entity,
      thing: filters.thing.trim(),
      from: filters.from ?? '',
      to: filters.to ?? '',
    }
  }

  const list = usePagedList((paging) => auditApi.list({ ...paging, ...query() }), 50)

  function clear() {
    Object.assign(filters, EMPTY)
  }

  const csvUrl = () => auditApi.csvUrl(query())

  return { ...list, filters, clear, csvUrl }
})
