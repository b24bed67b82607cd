import { PERMISSIONS } from '../../shared/permissions'
import {
  ComponentLotCodeParam,
  ContainedUnitDecisionInput,
  ContainInput,
  EndContainmentInput,
  RecallQuery,
  TraceScanParam,
} from '../../shared/schemas/trace'
import { unitHistoryPdf } from '../documents/unitHistory'
import { actorOf, signedInUser } from '../middleware/access'
import { countersignLimiters } from '../middleware/rateLimits'
import { parse } from '../middleware/validate'
import { containedUnit, decideContainedUnit, endContainment } from '../services/quality'
import { containComponentLot, recallCsv, recallScope } from '../services/trace'
import { traceUnit } from '../services/trace'
import { apiRoutes } from './registry'

export const traceRoutes = apiRoutes('/trace')

const safeName = (text: string) => text.replace(/[^A-Za-z0-9._-]/g, '_')
const serialOf = (p: { serial?: string }) => parse(TraceScanParam, p.serial)
const codeOf = (p: { code?: string }) => parse(ComponentLotCodeParam, p.code)

traceRoutes.get('/units/:serial', PERMISSIONS.traceUnits, async (req, res) => {
  res.json(await traceUnit(serialOf(req.params)))
})

traceRoutes.get('/units/:serial/history.json', PERMISSIONS.traceUnits, async (req, res) => {
  const trace = await traceUnit(serialOf(req.params))
  res.setHeader(
    'Content-Disposition',
    `attachment; filename="unit-history-${safeName(trace.unit.serial)}.json"`,
  )
  res.type('application/json').send(JSON.stringify(trace, null, 2))
})

traceRoutes.get('/units/:serial/history.pdf', PERMISSIONS.traceUnits, async (req, res) => {
  const trace = await traceUnit(serialOf(req.params))
  res.setHeader(
    'Content-Disposition',
    `attachment; filename="unit-history-${safeName(trace.unit.serial)}.pdf"`,
  )
  res.type('application/pdf').send(await unitHistoryPdf(trace))
})

traceRoutes.get('/component-lots/:code', PERMISSIONS.traceUnits, async (req, res) => {
  const { format } = parse(RecallQuery, req.query)
  const scope = await recallScope(codeOf(req.params))
  if (format === 'json') {
    res.json(scope)
    return
  }
  res.setHeader(
    'Content-Disposition',
    `attachment; filename="recall-scope-${safeName(scope.componentLot.internalCode)}.csv"`,
  )
  res.type('text/csv').send(recallCsv(scope))
})

traceRoutes.post(
  '/component-lots/:code/contain',
  PERMISSIONS.containComponentLots,
  async (req, res) => {
    const { reason } = parse(ContainInput, req.body)
    res.json(await containComponentLot(codeOf(req.params), reason, actorOf(req)))
  },
)

traceRoutes.post(
  '/component-lots/:code/end-containment',
  PERMISSIONS.containComponentLots,
  async (req, res) => {
    const input = parse(EndContainmentInput, req.body)
    res.json(await endContainment(codeOf(req.params), input, actorOf(req)))
  },
)

// A unit held by a containment whose lot was rejected: what may be decided, and the decision.
traceRoutes.get('/units/:serial/containment', PERMISSIONS.traceUnits, async (req, res) => {
  res.json(await containedUnit(serialOf(req.params)))
})

traceRoutes.post(
  '/units/:serial/containment-decision',
  PERMISSIONS.disposeNonconformances,
  ...countersignLimiters(),
  async (req, res) => {
    const input = parse(ContainedUnitDecisionInput, req.body)
    const actor = { ...actorOf(req), role: signedInUser(req).role }
    res.json(await decideContainedUnit(serialOf(req.params), input, actor))
  },
)
