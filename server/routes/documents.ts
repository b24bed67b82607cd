import { IdParam } from '../../shared/schemas/common'
import { PERMISSIONS } from '../../shared/permissions'
import { DocumentEmailInput } from '../../shared/schemas/shipping'
import { actorOf, signedInUser } from '../middleware/access'
import { sendStoredFile } from '../middleware/storedFile'
import { parse } from '../middleware/validate'
import { documentEmailDraft, emailDocument } from '../services/mail'
import { documentFile, getDocument } from '../services/documents'
import { getFile } from '../storage'
import { readHandler } from './handlers'
import { apiRoutes } from './registry'

export const documentRoutes = apiRoutes('/documents')

documentRoutes.get('/:id', PERMISSIONS.readLots, readHandler(getDocument))
documentRoutes.get('/:id/file', PERMISSIONS.readLots, async (req, res) => {
  const doc = await documentFile(parse(IdParam, req.params.id))
  const file = await getFile(doc.storageKey)
  await sendStoredFile(res, {
    body: file.body,
    contentType: 'application/pdf',
    filename: doc.filename,
  })
})

// Who may e-mail depends on the kind (documentEmail.ts); the route lets in every role that may
// e-mail some kind, and the service decides for this document.
const mailers = [
  ...new Set([...PERMISSIONS.issueCustomerDocuments, ...PERMISSIONS.emailLotReports]),
] as const
documentRoutes.get('/:id/email-draft', mailers, async (req, res) => {
  res.json(await documentEmailDraft(parse(IdParam, req.params.id), signedInUser(req).role))
})
documentRoutes.post('/:id/email', mailers, async (req, res) => {
  const actor = { ...actorOf(req), role: signedInUser(req).role }
  res
    .status(202)
    .json(
      await emailDocument(
        parse(IdParam, req.params.id),
        parse(DocumentEmailInput, req.body),
        actor,
      ),
    )
})
