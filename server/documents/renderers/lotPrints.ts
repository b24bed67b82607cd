import { LABEL_LAYOUT_KEYS } from '../../../shared/lots'
import { env } from '../../env'
import { Lot, Unit } from '../../models'
import type { Document } from '../../models'
import { toRevisionDto } from '../../services/recipes'
import { loadRevision } from '../../services/recipes'
import { labelSheetPdf } from '../labelSheet'
import type { LabelLayout } from '../labelSheet'
import { travelersPdf } from '../travelers'
import type { Progress } from './types'

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

/**
 * In tests only, a pause after each page (WAYMARK_TEST_RENDER_PAUSE_MS), so that a fault test can
 * kill a worker while its render is half done and see the job run again.
 */
function withTestPause(progress: Progress): Progress {
  const pauseMs = env.isTest ? env.WAYMARK_TEST_RENDER_PAUSE_MS : 0
  if (!pauseMs) return progress
  return async (fraction) => {
    await progress(fraction)
    if (fraction < 1) await new Promise((resolve) => setTimeout(resolve, pauseMs))
  }
}

/** One traveler page per unit of the document's lot. */
export async function renderTravelers(doc: Document, report: Progress): Promise<Buffer> {
  const progress = withTestPause(report)
  const { lot, rev, units, issuedAt } = await lotWithUnits(doc)
  return travelersPdf(
    {
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
    },
    progress,
  )
}

/** A label per serial of the document's lot, in the layout chosen when printing. */
export async function renderLabels(doc: Document, progress: Progress): Promise<Buffer> {
  const { lot, rev, units, issuedAt } = await lotWithUnits(doc)
  const layout = (LABEL_LAYOUT_KEYS as readonly string[]).includes(doc.layout ?? '')
    ? (doc.layout as LabelLayout)
    : 'a4_3x8'
  return labelSheetPdf(
    {
      productCode: rev.productCode,
      lotNumber: lot.number,
      serials: units.map((u) => u.serial),
      baseUrl: env.publicBaseUrl,
      layout,
      issuedAt,
    },
    progress,
  )
}
