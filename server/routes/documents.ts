import { IdParam } from '../../shared/schemas/common'
import { PERMISSIONS } from '../../shared/permissions'
import { parse } from '../middleware/validate'
import { documentFile, getDocument } from '../services/documents'
import { getFile } from '../storage'
import { apiRoutes } from './registry'

export const documentRoutes = apiRoutes('/documents')

documentRoutes.get('/:id', PERMISSIONS.readLots, async (req, res) => {
  res.json(await getDocument(parse(IdParam, req.params.id)))
})
documentRoutes.get('/:id/file', PERMISSIONS.readLots, async (req, res) => {
  const doc = await documentFile(parse(IdParam, req.params.id))
  const file = await getFile(doc.storageKey)
  res.type('application/pdf')
  res.setHeader(
    'Content-Disposition',
    `inline; filename="${doc.filename.replace(/["\\\r\n]/g, '_')}"`,
  )
  res.send(file.body)
})
