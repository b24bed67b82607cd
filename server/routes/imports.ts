import multer from 'multer'
import { IMPORT_MAX_BYTES } from '../../shared/imports'
import {
  ImportCreateInput,
  ImportMappingInput,
  ImportRowsQuery,
  ImportRunInput,
} from '../../shared/schemas/imports'
import { PERMISSIONS } from '../../shared/permissions'
import { actorOf } from '../middleware/access'
import { multipartUpload } from '../middleware/requestChecks'
import { parse } from '../middleware/validate'
import {
  getImport,
  getImportMapping,
  listImportRows,
  listImports,
  requestDryRun,
  requestImportRun,
  saveImportMapping,
  uploadBenchFile,
  toImportDto,
} from '../services/imports'
import { enqueueImport, enqueueImportCheck } from '../services/imports'
import { idOf, readHandler } from './handlers'
import { apiRoutes } from './registry'

export const importRoutes = apiRoutes('/imports')
const use = PERMISSIONS.importBenchData

// Held in memory: the file goes to the object store, never to this process's disk. One byte
// over the limit is enough for multer to answer 413.
const upload = multipartUpload(
  multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: IMPORT_MAX_BYTES, files: 1 },
  }).single('file'),
)

importRoutes.get('/', use, async (_req, res) => {
  res.json(await listImports())
})

importRoutes.post('/', use, upload, async (req, res) => {
  const { stationCode } = parse(ImportCreateInput, req.body)
  res.status(201).json(await uploadBenchFile(req.file, stationCode, actorOf(req)))
})

importRoutes.get('/:id', use, readHandler(getImport))

importRoutes.get('/:id/rows', use, async (req, res) => {
  res.json(await listImportRows(idOf(req.params), parse(ImportRowsQuery, req.query)))
})

// 202: the rows are planned by a job (a 20 MB file is too much for one request); the screen
// polls GET /imports/:id until it is `checked`.
importRoutes.post('/:id/dry-run', use, async (req, res) => {
  const imp = await requestDryRun(idOf(req.params), actorOf(req))
  await enqueueImportCheck(imp.id, imp.updatedAt)
  res.status(202).json(await toImportDto(imp))
})

// 202: the rows are recorded by the import job; the screen polls GET /imports/:id for progress.
importRoutes.post('/:id/run', use, async (req, res) => {
  const imp = await requestImportRun(
    idOf(req.params),
    parse(ImportRunInput, req.body),
    actorOf(req),
  )
  await enqueueImport(imp.id)
  res.status(202).json(await toImportDto(imp))
})

export const importMappingRoutes = apiRoutes('/stations')

importMappingRoutes.get('/:code/import-mapping', use, async (req, res) => {
  res.json(await getImportMapping(String(req.params.code)))
})

importMappingRoutes.put('/:code/import-mapping', use, async (req, res) => {
  res.json(
    await saveImportMapping(
      String(req.params.code),
      parse(ImportMappingInput, req.body),
      actorOf(req),
    ),
  )
})
