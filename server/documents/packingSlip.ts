import { MM, pdfBuffer } from './pdf'
import { drawLine, drawText, textHeight } from './pdfText'
import { customerPaper, INK, PAPER_STYLE, SHEET, SHEET_WIDTH } from './paper'

/** Everything a packing slip prints. */
export interface PackingSlipData {
  shopName: string
  shipment: {
    number: string
    orderRef: string
    carrier: string
    tracking: string
    shippedOn: string
  }
  customer: { name: string; address: string }
  units: {
    serial: string
    productCode: string
    productName: string
    revision: string
    lotNumber: string
  }[]
  packedBy: string
  issuedAt: Date
}

/**
 * A packing slip as an A4 PDF: ship-to, order, carrier and tracking, then every serial in the
 * box with its product, revision and lot, and a count per product to tick off at goods-in.
 */
export async function packingSlipPdf(
  data: PackingSlipData,
  onProgress?: (fraction: number) => Promise<void> | void,
): Promise<Buffer> {
  if (!data.units.length) throw new RangeError('a packing slip needs at least one unit')
  const { doc, w } = customerPaper(
    `Packing slip ${data.shipment.number}`,
    `${data.shopName} · Packing slip ${data.shipment.number} · ${data.units.length} units`,
    data.issuedAt,
  )
  w.newPage()
  const x = SHEET.margin
  w.firstHead(data.shopName, data.shipment.number, 'Packing slip')

  // Ship-to on the left, in a box a window envelope or a carrier's pouch shows.
  const boxW = 85 * MM
  const address = [data.customer.name, data.customer.address].filter(Boolean).join('\n')
  const addressH = textHeight(doc, address, PAPER_STYLE.body, boxW - 6 * MM)
  drawLine(doc, 'SHIP TO', x, w.y, PAPER_STYLE.head)
  doc
    .rect(x, w.y + 3.5 * MM, boxW, addressH + 6 * MM)
    .lineWidth(0.6)
    .strokeColor(INK.rule)
    .stroke()
  drawText(
    doc,
    address,
    x + 3 * MM,
    w.y + 6.5 * MM,
    { ...PAPER_STYLE.body, size: 10 },
    { width: boxW - 6 * MM },
  )
  const fx = x + boxW + 8 * MM
  const facts: [string, string][] = [
    ['Shipment', data.shipment.number],
    ['Shipped on', data.shipment.shippedOn],
    ['Customer order', data.shipment.orderRef || '—'],
    ['Carrier', data.shipment.carrier || '—'],
    ['Tracking', data.shipment.tracking || '—'],
  ]
  facts.forEach(([name, text], i) => {
    const fy = w.y + i * 6.5 * MM
    drawLine(doc, name, fx, fy + 0.6 * MM, PAPER_STYLE.label)
    drawLine(doc, text, fx + 26 * MM, fy, PAPER_STYLE.value, {
      width: SHEET_WIDTH - boxW - 34 * MM,
    })
  })
  w.y += Math.max(addressH + 12 * MM, facts.length * 6.5 * MM) + 2 * MM

  const counts = new Map<string, number>()
  for (const u of data.units) {
    const key = `${u.productCode} rev ${u.revision} — ${u.productName}`
    counts.set(key, (counts.get(key) ?? 0) + 1)
  }
  w.heading('Contents', 3 * MM)
  w.table(
    [
      { title: 'QTY', width: 10, align: 'right', style: PAPER_STYLE.cellBold },
      { title: 'PRODUCT', width: 90 },
    ],
    [...counts].map(([what, n]) => [String(n), what]),
  )
  w.heading('Serials in this shipment')
  w.table(
    [
      { title: '#', width: 6, align: 'right' },
      { title: 'SERIAL', width: 30, style: PAPER_STYLE.cellBold },
      { title: 'PRODUCT', width: 16 },
      { title: 'REV', width: 8 },
      { title: 'LOT', width: 14 },
      { title: 'RECEIVED (TICK)', width: 16 },
    ],
    data.units.map((u, i) => [String(i + 1), u.serial, u.productCode, u.revision, u.lotNumber, '']),
  )
  await onProgress?.(0.8)
  w.need(24 * MM)
  w.y += 8 * MM
  w.fields(
    [
      ['Packed by', data.packedBy],
      ['Units', String(data.units.length)],
      ['Checked by (receiver)', ''],
    ],
    3,
  )
  w.finish()
  return pdfBuffer(doc)
}
