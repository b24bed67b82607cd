import { unitUrl } from '../../shared/links'
import { HIGH_VOLTAGE_CAUTION } from '../../shared/safety/hipot'
import type { StepDto } from '../../shared/schemas/recipes'
import { STATION_KIND_LABELS } from '../../shared/stations'
import { newPdf, pdfBuffer } from './pdf'
import { fixedPdfInfo } from './pdfInfo'
import { registerGreekFonts } from './pdfText'
import { drawFooter, drawHeader } from './travelerHeader'
import type { SheetInfo } from './travelerHeader'
import { PAGE, paginate } from './travelerLayout'
import { drawPiece, drawTableHead } from './travelerParts'

/** Everything a lot's travelers print; the route is the released revision's, frozen. */
export interface TravelerData {
  product: { code: string; name: string }
  revision: { letter: string }
  lot: { number: string; orderRef: string; customerName: string; dueDate: string | null }
  /** The released route, in position order, with checks. */
  steps: StepDto[]
  /** One sheet (or more, if the route is long) per unit. */
  units: { serial: string }[]
  /** The public base URL; each QR holds unitUrl(baseUrl, serial). */
  baseUrl: string
  /** Fixed per lot: the PDF's creation date, so a rerun gives the same bytes. */
  issuedAt: Date
}

const kindLabel = (step: StepDto) => STATION_KIND_LABELS[step.stationKind]

/**
 * The travelers of one lot as a single A4 PDF: one sheet per unit (more when the route does not
 * fit one), each with the serial and its QR, the route with checks and limits, sign-off boxes,
 * and the high-voltage caution on hipot and load-test steps.
 * @param onProgress awaited after each unit with the share of units done, ending at 1
 */
export async function travelersPdf(
  data: TravelerData,
  onProgress?: (fraction: number) => Promise<void> | void,
): Promise<Buffer> {
  if (!data.units.length) throw new RangeError('a traveler PDF needs at least one unit')
  const doc = newPdf({
    size: 'A4',
    margin: 0,
    info: fixedPdfInfo(`Travelers, lot ${data.lot.number}`, data.issuedAt),
  })
  registerGreekFonts(doc)
  // The route is the same for every unit, so it is measured once.
  const pages = paginate(doc, data.steps, HIGH_VOLTAGE_CAUTION, kindLabel)
  const issuedOn = data.issuedAt.toISOString().slice(0, 10)
  for (const [i, unit] of data.units.entries()) {
    const qrPayload = unitUrl(data.baseUrl, unit.serial)
    for (const [p, pieces] of pages.entries()) {
      doc.addPage({ size: 'A4', margin: 0 })
      const info: SheetInfo = {
        serial: unit.serial,
        productCode: data.product.code,
        productName: data.product.name,
        revision: data.revision.letter,
        lotNumber: data.lot.number,
        orderRef: data.lot.orderRef,
        customerName: data.lot.customerName,
        dueDate: data.lot.dueDate,
        issuedOn,
        stepCount: data.steps.length,
        sheet: p + 1,
        sheetCount: pages.length,
        qrPayload,
      }
      drawHeader(doc, info)
      drawTableHead(doc)
      let y = PAGE.tableTop + PAGE.tableHeadHeight
      for (const piece of pieces) {
        drawPiece(doc, piece, y, kindLabel(piece.step), HIGH_VOLTAGE_CAUTION)
        y += piece.height
      }
      drawFooter(doc, info)
    }
    await onProgress?.((i + 1) / data.units.length)
  }
  return pdfBuffer(doc)
}
