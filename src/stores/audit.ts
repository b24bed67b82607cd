import { defineStore } from 'pinia'
import { reactive, ref } from 'vue'
import type { AuditEventDto } from '@shared/schemas/audit'
import { auditApi } from '@/api/audit'

/** The filters of the audit screen; empty strings mean "any". */
export interface AuditFilters {
  entity: string
  action: string
  actor: string
}

export const useAuditStore = defineStore('audit', () => {
  /** Events of the current page, newest first. */
  const rows = ref<AuditEventDto[]>([])
  /** Events matching the filters, over all pages. */
  const total = ref(0)
  const page = ref(1)
  const pageSize = ref(50)
  const filters = reactive<AuditFilters>({ entity: '', action: '', actor: '' })
  /** True while a page is being fetched. */
  const isLoading = ref(false)

  /** Fetches the current page with the current filters; throws ApiError. */
  async function fetchPage() {
    isLoading.value = true
    try {
      const result = await auditApi.list({
        page: page.value,
        pageSize: pageSize.value,
        entity: filters.entity.trim(),
        action: filters.action.trim(),
        actor: filters.actor.trim(),
      })
      rows.value = result.rows
      total.value = result.total
    } finally {
      isLoading.value = false
    }
  }

  /** Applies changed filters from the first page. */
  async function search() {
    page.value = 1
    await fetchPage()
  }

  return { rows, total, page, pageSize, filters, isLoading, fetchPage, search }
})
