import { z } from 'zod'
import { PERMISSIONS } from '../../shared/permissions'
import { IdParam } from '../../shared/schemas/common'
import { OutboxQuery } from '../../shared/schemas/outbox'
import { DraftUpdateInput } from '../../shared/schemas/trace'
import { actorOf } from '../middleware/access'
import { sendStoredFile } from '../middleware/storedFile'
import { parse } from '../middleware/validate'
import {
  emailAttachment,
  getEmail,
  listEmails,
  retryEmail,
  sendDraft,
  updateDraft,
} from '../services/mail'
import { getFile } from '../storage'
import { changeHandler, queryHandler, readHandler } from './handlers'
import { apiRoutes } from './registry'

export const outboxRoutes = apiRoutes('/outbox')

const AttachmentIndex = z.coerce.number().int().min(0).max(999)

outboxRoutes.get('/', PERMISSIONS.readOutbox, queryHandler(OutboxQuery, listEmails))
outboxRoutes.get('/:id', PERMISSIONS.readOutbox, readHandler(getEmail))
outboxRoutes.get('/:id/attachments/:index', PERMISSIONS.readOutbox, async (req, res) => {
  const a = await emailAttachment(
    parse(IdParam, req.params.id),
    parse(AttachmentIndex, req.params.index),
  )
  const file = await getFile(a.storageKey)
  // Always a download: a received attachment is whatever a sender put in, HTML included.
  await sendStoredFile(res, { body: file.body, contentType: a.contentType, filename: a.filename })
})

// Drafts (recall letters) wait for a person: edit them, then send.
outboxRoutes.patch(
  '/:id',
  PERMISSIONS.sendDraftEmails,
  changeHandler(DraftUpdateInput, updateDraft),
)
outboxRoutes.post('/:id/send', PERMISSIONS.sendDraftEmails, async (req, res) => {
  res.json(await sendDraft(parse(IdParam, req.params.id), actorOf(req)))
})

// A message the relay refused until its last attempt goes out again once someone says so.
outboxRoutes.post('/:id/retry', PERMISSIONS.retryEmails, async (req, res) => {
  res.json(await retryEmail(parse(IdParam, req.params.id), actorOf(req)))
})
