/** One row of the append-only audit log, as the Admin screen lists it. */
export interface AuditEventDto {
  id: string
  at: string
  actorId: string | null
  actorEmail: string | null
  action: string
  entity: string
  entityId: string | null
  before: unknown
  after: unknown
  ip: string | null
}

export interface AuditPageDto {
  rows: AuditEventDto[]
  total: number
}
