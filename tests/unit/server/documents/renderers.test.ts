import { PDFParse } from 'pdf-parse'
import { describe, expect, it } from 'vitest'
import { DOCUMENT_KINDS } from '../../../../shared/lots'
import { SAFETY_FOOTER } from '../../../../server/documents/lotReport'
import type { LotReportData } from '../../../../server/documents/lotReportTypes'
import { isRenderedKind, renderDocumentPdf } from '../../../../server/documents/renderers'

// The renderers draw the data they are given, with no database: these run without one.

async function pdfText(pdf: Buffer): Promise<{ text: string; pages: number }> {
  const parser = new PDFParse({ data: pdf })
  try {
    const result = await parser.getText()
    return { text: result.text.normalize('NFKC').replace(/\s+/g, ' '), pages: result.pages.length }
  } finally {
    await parser.destroy()
  }
}

/** A released lot with no step runs yet: every section of the report has its empty wording. */
function emptyLot(): LotReportData {
  const none = { value: null, interval: { low: 0, high: 1 } }
  return {
    lot: {
      number: 'L-0007',
      status: 'released',
      quantity: 12,
      orderRef: 'PO-81',
      customerName: 'Halden Rail Systems',
      dueDate: '2026-12-20',
      releasedAt: new Date('2026-12-01T08:00:00Z'),
      closedAt: null,
      createdAt: new Date('2026-11-30T15:00:00Z'),
    },
    product: { code: 'FP24', name: 'Flyback 24 V' },
    revision: { letter: 'B' },
    asOf: new Date('2026-12-01T08:00:00Z'),
    yield: {
      lotId: 'lot-7',
      steps: [],
      rty: null,
      lotFpy: none,
      finalYield: none,
      dpu: null,
      started: 0,
      finished: 0,
      passed: 0,
      scrapped: 0,
      wip: [],
    },
    dpu: { value: null, interval: { low: 0, high: 0 }, defects: 0 },
    pareto: [],
    turnSeries: [],
    capability: [],
    keyChecks: [],
    nonconformances: [],
  }
}

describe('document renderers', { timeout: 30_000 }, () => {
  it('have a renderer for every kind but the unit history, which the trace page draws', () => {
    const rendered = DOCUMENT_KINDS.filter((k) => isRenderedKind(k))
    expect(rendered).toEqual(['travelers', 'labels', 'lot_report', 'certificate', 'packing_slip'])
    expect(isRenderedKind('unit_history')).toBe(false)
  })

  it('draw a lot report from its data alone, reporting progress up to 1', async () => {
    const seen: number[] = []
    const pdf = await renderDocumentPdf({ kind: 'lot_report', data: emptyLot() }, async (f) => {
      seen.push(f)
    })
    const { text, pages } = await pdfText(pdf)
    expect(pages).toBe(1)
    expect(text).toContain('Lot L-0007')
    expect(text).toContain('FP24 rev B · Flyback 24 V')
    expect(text).toContain('No nonconformances in this lot.')
    expect(text).toContain('No numeric readings yet.')
    expect(text).toContain(SAFETY_FOOTER.slice(0, 60))
    expect(seen.at(-1)).toBe(1)
    expect(seen).toEqual([...seen].sort((a, b) => a - b))
  })

  it('give the same bytes for the same data, so a rerun job stores the same file', async () => {
    const quiet = async () => {}
    const a = await renderDocumentPdf({ kind: 'lot_report', data: emptyLot() }, quiet)
    const b = await renderDocumentPdf({ kind: 'lot_report', data: emptyLot() }, quiet)
    expect(a.equals(b)).toBe(true)
  })
})
