import { Op } from 'sequelize'
import type { WhereOptions } from 'sequelize'
import type { AuditPageDto } from '../../../shared/schemas/audit'
import { AuditEvent } from '../../models'

export interface AuditQuery {
  page: number
  pageSize: number
  entity?: string
  action?: string
  actor?: string
}

/** A page of the audit log, newest first, filtered by entity, action prefix and actor e-mail. */
export async function listAuditEvents(q: AuditQuery): Promise<AuditPageDto> {
  const where: WhereOptions<AuditEvent> = {}
  if (q.entity) where.entity = q.entity
  if (q.action) where.action = { [Op.startsWith]: q.action }
  if (q.actor) where.actorEmail = { [Op.iLike]: `%${q.actor}%` }
  const { rows, count } = await AuditEvent.findAndCountAll({
    where,
    order: [
      ['at', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  })
  return {
    total: count,
    rows: rows.map((r) => ({
      id: String(r.id),
      at: r.at.toISOString(),
      actorId: r.actorId,
      actorEmail: r.actorEmail,
      action: r.action,
      entity: r.entity,
      entityId: r.entityId,
      before: r.before,
      after: r.after,
      ip: r.ip,
    })),
  }
}
