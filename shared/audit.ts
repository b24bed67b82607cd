/**
 * How the audit log reads to a person: an action as words and a before/after pair as a list of
 * changed fields. Pure, so the screen, the CSV export and the tests use the same wording.
 */

/** The kinds of record the services audit (`audit_events.entity`), in the order a filter lists them. */
export const AUDITED_ENTITIES = [
  'unit',
  'lot',
  'component_lot',
  'nonconformance',
  'revision',
  'route_step',
  'check',
  'winding',
  'bom_line',
  'product',
  'part',
  'defect_code',
  'customer',
  'shipment',
  'service_case',
  'document',
  'email',
  'import',
  'alert',
  'station',
  'user',
] as const
export type AuditedEntity = (typeof AUDITED_ENTITIES)[number]

/** Whether an `audit_events.entity` is one of the kinds above. */
export function isAuditedEntity(entity: string): entity is AuditedEntity {
  return (AUDITED_ENTITIES as readonly string[]).includes(entity)
}

/** One field that differs between the record before and after a change, as text. */
export interface AuditChange {
  field: string
  before: string
  after: string
}

/** Fields never shown, even hashed: a password's or PIN's hash is nobody's business. */
const HIDDEN = /hash|password|secret|token|pin$/i

/** Bookkeeping every row carries; its change says nothing the row's time does not. */
const BOOKKEEPING = new Set(['updatedAt', 'createdAt', 'updated_at', 'created_at'])

/** Verbs the services use in actions (`entity.verb`), as the past tense a reader expects. */
const VERBS: Record<string, string> = {
  create: 'created',
  update: 'changed',
  delete: 'deleted',
  release: 'released',
  obsolete: 'made obsolete',
  status: 'status changed',
  dispose: 'disposed',
  hold: 'put on hold',
  unhold: 'hold lifted',
  close: 'closed',
  reopen: 'reopened',
  open: 'opened',
  copy: 'copied',
  acknowledge: 'acknowledged',
  raise: 'raised',
  receive: 'received',
  certificate: 'certificate attached',
  contain: 'contained',
  end_containment: 'containment ended',
  containment_decision: 'containment decision',
  failed: 'refused',
  email: 'e-mailed',
  request: 'requested',
  draft: 'drafted',
  edit_draft: 'draft edited',
  queue: 'queued',
  send_draft: 'draft sent',
  dry_run: 'checked without recording',
  run: 'recorded',
  upload: 'uploaded',
  save: 'saved',
  reorder: 'reordered',
  sign_in: 'signed in',
  sign_in_failed: 'sign-in refused',
  sign_out: 'signed out',
}

/** `camelCase` or `snake_case` as lower-case words, an `…Id` suffix dropped: `reworkToStepId` → "rework to step". */
export function fieldWords(key: string): string {
  const words = key
    .replace(/Ids?$/, (m) => (m === 'Ids' ? 's' : ''))
    .replace(/_ids?$/, (m) => (m === '_ids' ? 's' : ''))
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/_/g, ' ')
    .toLowerCase()
    .trim()
  return words || key
}

/** `revision.release` → "revision released"; an unknown verb is kept as words. */
export function actionWords(action: string): string {
  const dot = action.indexOf('.')
  if (dot < 0) return fieldWords(action)
  const entity = fieldWords(action.slice(0, dot))
  const verb = action.slice(dot + 1)
  return `${entity} ${VERBS[verb] ?? fieldWords(verb)}`
}

/** A value as one line of text: `—` for nothing, yes/no, lists joined, objects as compact JSON. */
export function valueText(value: unknown): string {
  if (value === null || value === undefined || value === '') return '—'
  if (typeof value === 'boolean') return value ? 'yes' : 'no'
  if (Array.isArray(value)) return value.length ? value.map(valueText).join(', ') : '—'
  if (typeof value === 'object') return JSON.stringify(value)
  return String(value)
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value)
}

/**
 * The fields that differ between `before` and `after`, in the order the record lists them. A
 * creation lists every field with `—` before, a deletion every field with `—` after; a value that
 * is not a record is one change named "value". Hidden fields (hashes) show as "(changed)"; the row's
 * own created/updated times are left out.
 */
export function auditChanges(before: unknown, after: unknown): AuditChange[] {
  const b = isRecord(before) ? before : before == null ? {} : { value: before }
  const a = isRecord(after) ? after : after == null ? {} : { value: after }
  const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])]
  const changes: AuditChange[] = []
  for (const key of keys) {
    if (BOOKKEEPING.has(key)) continue
    const was = valueText(b[key])
    const now = valueText(a[key])
    if (was === now) continue
    changes.push(
      HIDDEN.test(key)
        ? { field: fieldWords(key), before: '(hidden)', after: '(changed)' }
        : { field: fieldWords(key), before: was, after: now },
    )
  }
  return changes
}
