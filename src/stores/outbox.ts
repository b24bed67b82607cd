import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { EmailDto, EmailStatus } from '@shared/schemas/outbox'
import { outboxApi } from '@/api/outbox'
import { usePagedList } from './lists/usePagedList'

export const useOutboxStore = defineStore('outbox', () => {
  /** The status filter; an empty string means any status. */
  const status = ref<EmailStatus | ''>('')
  /** The id of the e-mail open in the detail panel, or null when it is closed. */
  const openId = ref<string | null>(null)
  /** The open e-mail once it has loaded. */
  const current = ref<EmailDto | null>(null)
  /** True while the open e-mail is being fetched. */
  const isCurrentLoading = ref(false)

  const list = usePagedList(
    (paging) =>
      outboxApi.list({
        ...paging,
        status: status.value || undefined,
      }),
    50,
  )

  /** Opens one e-mail in the detail panel; throws ApiError and closes the panel on failure. */
  async function open(id: string) {
    openId.value = id
    current.value = null
    isCurrentLoading.value = true
    try {
      const email = await outboxApi.get(id)
      // Another row may have been clicked while this one loaded; the latest click wins.
      if (openId.value === id) current.value = email
    } catch (error) {
      if (openId.value === id) openId.value = null
      throw error
    } finally {
      if (openId.value === id || openId.value === null) isCurrentLoading.value = false
    }
  }

  function close() {
    openId.value = null
    current.value = null
  }

  /** Download address of the open e-mail's attachment at `index`. */
  function attachmentUrl(index: number): string {
    return current.value ? outboxApi.attachmentUrl(current.value.id, index) : ''
  }

  /** Saves an edited draft; throws ApiError. */
  async function saveDraft(input: { subject: string; text: string }) {
    if (!current.value) return
    current.value = await outboxApi.updateDraft(current.value.id, input)
  }

  /** Saves the draft as shown and sends it; throws ApiError. */
  async function sendDraft(input: { subject: string; text: string }) {
    if (!current.value) return
    const id = current.value.id
    if (input.subject !== current.value.subject || input.text !== current.value.text)
      await outboxApi.updateDraft(id, input)
    current.value = await outboxApi.sendDraft(id)
    await list.fetchPage()
  }

  return {
    ...list,
    saveDraft,
    sendDraft,
    status,
    openId,
    current,
    isCurrentLoading,
    open,
    close,
    attachmentUrl,
  }
})
