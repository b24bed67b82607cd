import type { Transaction } from 'sequelize'
import type { DocumentKind, LabelLayoutKey } from '../../../shared/lots'
import type { DocumentDto } from '../../../shared/schemas/lots'
import { AppError } from '../../errors'
import { Document } from '../../models'
import { enqueueDocument } from './queue'
import { auditAction } from '../admin'
import type { Actor } from '../admin'

export function toDocumentDto(d: Document): DocumentDto {
  return {
    id: d.id,
    kind: d.kind,
    layout: d.layout,
    status: d.status,
    progress: d.progress,
    filename: d.filename,
    size: d.size,
    error: d.error,
    createdAt: d.createdAt.toISOString(),
    finishedAt: d.finishedAt?.toISOString() ?? null,
  }
}

/** What a document is of: a lot's prints, or a shipment's or unit's papers. */
export interface DocumentSpec {
  kind: DocumentKind
  filename: string
  lotId?: string
  unitId?: string
  shipmentId?: string
  layout?: LabelLayoutKey
}

/**
 * The file name of a lot's travelers, label sheet or report, e.g. `L-0042-labels-a4_3x8.pdf`
 * or `L-0042-lot-report.pdf`.
 */
export function lotPrintFilename(
  lotNumber: string,
  kind: 'travelers' | 'labels' | 'lot_report',
  layout?: LabelLayoutKey,
): string {
  if (kind === 'lot_report') return `${lotNumber}-lot-report.pdf`
  return `${lotNumber}-${kind === 'labels' ? `labels-${layout ?? 'a4_3x8'}` : kind}.pdf`
}

/**
 * Writes a `queued` document row in the caller's transaction and enqueues its job once that
 * transaction commits, so the worker never looks for a row that is not there yet.
 */
export async function requestDocument(
  spec: DocumentSpec,
  actor: Actor,
  transaction: Transaction,
  /** When it was asked for, if not now: the demo seed's clock. */
  at?: Date,
): Promise<Document> {
  const doc = await Document.create(
    {
      kind: spec.kind,
      lotId: spec.lotId ?? null,
      unitId: spec.unitId ?? null,
      shipmentId: spec.shipmentId ?? null,
      layout: spec.kind === 'labels' ? (spec.layout ?? 'a4_3x8') : null,
      filename: spec.filename,
      storageKey: null,
      sha256: null,
      size: null,
      error: null,
      createdBy: actor.id,
      finishedAt: null,
      ...(at ? { createdAt: at } : {}),
    },
    { transaction },
  )
  await auditAction(
    actor,
    'document.request',
    doc.id,
    {
      after: {
        kind: spec.kind,
        lotId: doc.lotId,
        unitId: doc.unitId,
        shipmentId: doc.shipmentId,
        layout: doc.layout,
      },
      at,
    },
    transaction,
  )
  transaction.afterCommit(() => void enqueueDocument(doc.id))
  return doc
}

/** A lot's documents, newest first. */
export async function listLotDocuments(lotId: string): Promise<DocumentDto[]> {
  return (await Document.findAll({ where: { lotId }, order: [['createdAt', 'DESC']] })).map(
    toDocumentDto,
  )
}

/** One document's status and progress. */
export async function getDocument(id: string): Promise<DocumentDto> {
  const doc = await Document.findByPk(id)
  if (!doc) throw AppError.notFound(`document ${id}`)
  return toDocumentDto(doc)
}

/** Where a finished document's file is stored; 409 while it is still being made. */
export async function documentFile(id: string): Promise<{ storageKey: string; filename: string }> {
  const doc = await Document.findByPk(id)
  if (!doc) throw AppError.notFound(`document ${id}`)
  if (doc.status !== 'done' || !doc.storageKey)
    throw AppError.conflict(
      'document_not_ready',
      `the document is ${doc.status}${doc.status === 'failed' ? `: ${doc.error}` : ''}`,
    )
  return { storageKey: doc.storageKey, filename: doc.filename }
}
