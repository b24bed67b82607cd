import { defineStore } from 'pinia'
import { ref } from 'vue'
import type { DocumentDto } from '@shared/schemas/lots'
import type { DocumentEmailDraftDto, DocumentEmailInput } from '@shared/schemas/shipping'
import { documentsApi } from '@/api/documents'

/** E-mailing a finished document (certificate, packing slip, lot report) to a customer. */
export const useDocumentMailStore = defineStore('documentMail', () => {
  /** The document the e-mail dialog is open for. */
  const document = ref<DocumentDto | null>(null)
  /** What the dialog starts from: the customer's contact, subject, body. */
  const draft = ref<DocumentEmailDraftDto | null>(null)

  /** Opens the dialog for a finished document; throws ApiError (403 for a role the kind refuses). */
  async function start(doc: DocumentDto) {
    document.value = doc
    draft.value = null
    draft.value = await documentsApi.emailDraft(doc.id)
  }

  /** Queues the e-mail with the PDF attached; throws ApiError with field messages. */
  async function send(input: DocumentEmailInput) {
    if (!document.value) return null
    const email = await documentsApi.email(document.value.id, input)
    cancel()
    return email
  }

  function cancel() {
    document.value = null
    draft.value = null
  }

  return { document, draft, start, send, cancel }
})
