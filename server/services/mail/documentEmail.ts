import type { Transaction } from 'sequelize'
import { DOCUMENT_KIND_LABELS } from '../../../shared/lots'
import type { DocumentKind } from '../../../shared/lots'
import { can } from '../../../shared/permissions'
import type { Permission } from '../../../shared/permissions'
import type { Role } from '../../../shared/roles'
import type { EmailDto } from '../../../shared/schemas/outbox'
import type { DocumentEmailDraftDto, DocumentEmailInput } from '../../../shared/schemas/shipping'
import { env } from '../../env'
import { AppError } from '../../errors'
import { Document } from '../../models'
import { recordAudit } from '../admin'
import type { Actor } from '../admin'
import { queueEmail } from './outbox'
import { select, withTransaction } from '../../db/sql'

/** "Certificate of conformance S-0007 from Ferncastle Power": what the paper is, and whose. */
function subjectOf(doc: Document): string {
  const stem = doc.filename.replace(/\.pdf$/, '').replace(/-(certificate|packing-slip)$/, '')
  return `${DOCUMENT_KIND_LABELS[doc.kind]} ${stem} from ${env.WAYMARK_SHOP_NAME}`
}

/**
 * Who may e-mail each kind of document. Customer papers go out from service, the lead or an
 * admin; a lot report from the people who read yields. Travelers and labels stay in the shop.
 */
export const EMAIL_PERMISSION: Record<DocumentKind, Permission | null> = {
  certificate: 'issueCustomerDocuments',
  packing_slip: 'issueCustomerDocuments',
  unit_history: 'issueCustomerDocuments',
  lot_report: 'emailLotReports',
  travelers: null,
  labels: null,
}

interface Recipient {
  name: string
  contact_email: string
}

/**
 * The customer a document is for: its shipment's, else the latest shipment of its unit, else its
 * lot's (a lot report, or a unit that has not shipped).
 */
async function documentCustomer(
  doc: Document,
  transaction?: Transaction,
): Promise<Recipient | null> {
  const [row] = await select<Recipient>(
    `SELECT c.name, c.contact_email FROM customers c WHERE c.id = COALESCE(
       (SELECT s.customer_id FROM shipments s WHERE s.id = :shipmentId),
       (SELECT s.customer_id FROM shipment_units su JOIN shipments s ON s.id = su.shipment_id
         WHERE su.unit_id = :unitId ORDER BY s.shipped_on DESC, s.created_at DESC LIMIT 1),
       (SELECT l.customer_id FROM lots l WHERE l.id = COALESCE(:lotId,
         (SELECT u.lot_id FROM units u WHERE u.id = :unitId))))`,
    {
      replacements: { shipmentId: doc.shipmentId, unitId: doc.unitId, lotId: doc.lotId },
      transaction,
    },
  )
  return row ?? null
}

function draftText(doc: Document, customer: Recipient | null, note: string): string {
  const what = DOCUMENT_KIND_LABELS[doc.kind].toLowerCase()
  return [
    customer ? `Dear ${customer.name},` : 'Hello,',
    '',
    ...(note ? [note, ''] : []),
    `Please find attached the ${what} ${doc.filename}.`,
    '',
    env.WAYMARK_SHOP_NAME,
  ].join('\n')
}

async function finishedDocument(id: string, transaction?: Transaction): Promise<Document> {
  const doc = await Document.findByPk(id, { transaction })
  if (!doc) throw AppError.notFound(`document ${id}`)
  if (doc.status !== 'done' || !doc.storageKey || doc.size === null)
    throw AppError.conflict(
      'document_not_ready',
      `the document is ${doc.status}: only a finished document can be e-mailed`,
    )
  return doc
}

function checkRole(doc: Document, role: Role): void {
  const permission = EMAIL_PERMISSION[doc.kind]
  if (!permission)
    throw AppError.conflict(
      'document_not_mailable',
      `${DOCUMENT_KIND_LABELS[doc.kind].toLowerCase()} are shop papers and are not e-mailed`,
    )
  if (!can(role, permission))
    throw AppError.forbidden(
      `your role may not e-mail a ${DOCUMENT_KIND_LABELS[doc.kind].toLowerCase()}`,
    )
}

/** What the e-mail dialog offers for a finished document: its customer's contact, subject, body. */
export async function documentEmailDraft(id: string, role: Role): Promise<DocumentEmailDraftDto> {
  const doc = await finishedDocument(id)
  checkRole(doc, role)
  const customer = await documentCustomer(doc)
  return {
    to: customer?.contact_email ? [customer.contact_email] : [],
    subject: subjectOf(doc),
    text: draftText(doc, customer, ''),
    customerName: customer?.name ?? null,
  }
}

/**
 * Queues a finished document as a PDF attachment on the `mail` queue. Without recipients it
 * goes to the contact e-mail of the document's customer. The attachment is the stored file
 * itself (no copy), and the e-mail row and the audit event commit together.
 */
export async function emailDocument(
  id: string,
  input: DocumentEmailInput,
  actor: Actor & { role: Role },
  /** When it was sent off, if not now: the demo seed's clock. */
  at?: Date,
): Promise<EmailDto> {
  return withTransaction(async (transaction) => {
    const doc = await finishedDocument(id, transaction)
    checkRole(doc, actor.role)
    const customer = await documentCustomer(doc, transaction)
    const to = input.to.length ? input.to : customer?.contact_email ? [customer.contact_email] : []
    if (!to.length)
      throw AppError.badRequest('to: name a recipient; this customer has no contact e-mail', {
        to: 'name at least one recipient',
      })
    const email = await queueEmail(
      {
        to,
        subject: subjectOf(doc),
        text: draftText(doc, customer, input.note),
        attachments: [
          {
            filename: doc.filename,
            contentType: 'application/pdf',
            storageKey: doc.storageKey!,
            size: doc.size!,
          },
        ],
        related: { entity: 'document', id: doc.id },
      },
      actor,
      transaction,
      at,
    )
    await recordAudit(
      actor,
      {
        action: 'document.email',
        entity: 'document',
        entityId: doc.id,
        after: { kind: doc.kind, filename: doc.filename, to, emailId: email.id },
        at,
      },
      transaction,
    )
    return email
  })
}
