import { LABEL_LAYOUT_KEYS } from '../../../shared/lots'
import type { LabelLayout, LabelSheetData } from '../../documents/labelSheet'
import type { TravelerData } from '../../documents/travelers'
import { env } from '../../env'
import { Lot, Unit } from '../../models'
import type { Document } from '../../models'
import { toRevisionDto } from '../recipes'
import { loadRevision } from '../recipes'

// What a lot's prints (travelers and serial labels) show, read from the database for the
// renderers in server/documents/.

async function lotWithUnits(doc: Document) {
  const lot = await Lot.findByPk(doc.lotId!, { rejectOnEmpty: true })
  const rev = toRevisionDto(await loadRevision(lot.revisionId))
  const units = await Unit.findAll({
    where: { lotId: lot.id },
    attributes: ['serial'],
    order: [['serial', 'ASC']],
  })
  return { lot, rev, units, issuedAt: lot.releasedAt ?? lot.createdAt }
}

/** What the travelers of the document's lot print: one page per unit, the released route. */
export async function travelerData(doc: Document): Promise<TravelerData> {
  const { lot, rev, units, issuedAt } = await lotWithUnits(doc)
  return {
    product: { code: rev.productCode, name: rev.productName },
    revision: { letter: rev.letter },
    lot: {
      number: lot.number,
      orderRef: lot.orderRef,
      customerName: lot.customerName,
      dueDate: lot.dueDate,
    },
    steps: rev.steps,
    units: units.map((u) => ({ serial: u.serial })),
    baseUrl: env.publicBaseUrl,
    issuedAt,
  }
}

/** What the label sheet of the document's lot prints, in the layout chosen when printing. */
export async function labelSheetData(doc: Document): Promise<LabelSheetData> {
  const { lot, rev, units, issuedAt } = await lotWithUnits(doc)
  const layout = (LABEL_LAYOUT_KEYS as readonly string[]).includes(doc.layout ?? '')
    ? (doc.layout as LabelLayout)
    : 'a4_3x8'
  return {
    productCode: rev.productCode,
    lotNumber: lot.number,
    serials: units.map((u) => u.serial),
    baseUrl: env.publicBaseUrl,
    layout,
    issuedAt,
  }
}
