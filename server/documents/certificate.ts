import { HIGH_VOLTAGE_KINDS } from '../../shared/stations'
import type { StationKind } from '../../shared/stations'
import type { CheckDto } from '../../shared/schemas/recipes'
import { checkLimitWords, limitNumber } from '../../shared/recipes/limitText'
import { MM, pdfBuffer } from './pdf'
import { drawLine, drawText, textHeight } from './pdfText'
import { customerPaper, INK, PAPER_STYLE, PaperWriter, SHEET, SHEET_WIDTH } from './paper'
import type { Column } from './paper'

export type CertificateCheck = Pick<
  CheckDto,
  | 'id'
  | 'key'
  | 'label'
  | 'kind'
  | 'unit'
  | 'nominal'
  | 'lower'
  | 'upper'
  | 'decimals'
  | 'choices'
  | 'derived'
>

/** One recorded value of a check in a unit's passing run of a step. */
export interface CertificateValue {
  number: number | null
  text: string | null
  boolean: boolean | null
  isPass: boolean
  isDerived: boolean
}

/** The run of a step that counts for the certificate: the unit's last passing one. */
export interface CertificateRun {
  stepId: string
  attempt: number
  finishedOn: string
  values: Record<string, CertificateValue>
}

/** Units of one product revision, with that revision's route. */
export interface CertificateGroup {
  product: { code: string; name: string }
  revision: string
  steps: {
    id: string
    position: number
    name: string
    stationKind: StationKind
    checks: CertificateCheck[]
  }[]
  units: { serial: string; lotNumber: string; passedOn: string | null; runs: CertificateRun[] }[]
}

/** Everything a certificate of conformance prints. */
export interface CertificateData {
  shopName: string
  /** What the certificate is of: a shipment number or a serial. */
  reference: string
  scope: 'shipment' | 'unit'
  issuedAt: Date
  issuedBy: string
  customer: { name: string; address: string } | null
  shipment: { number: string; orderRef: string; shippedOn: string } | null
  groups: CertificateGroup[]
}

/** A value as printed: rounded to the check's decimals, with its unit. */
export function certificateValueWords(
  check: CertificateCheck,
  v: CertificateValue | undefined,
): string {
  if (!v) return 'not recorded'
  if (check.kind === 'numeric' && v.number !== null)
    return `${limitNumber(v.number, check.decimals)}${check.unit ? ` ${check.unit}` : ''}`
  if (check.kind === 'boolean') return v.boolean ? 'yes' : 'no'
  return v.text ?? '—'
}

/** Limits in certificate words; a tick box reads "required". */
function limitWords(check: CertificateCheck): string {
  if (check.kind === 'boolean') return 'required'
  if (check.kind === 'text') return 'recorded'
  return checkLimitWords(check)
}

const resultWord = (isPass: boolean) => (isPass ? 'PASS' : 'FAIL')

/** The statement on every certificate, naming the shop and the revision(s). */
export function conformanceStatement(data: CertificateData): string {
  const revisions = data.groups.map((g) => `${g.product.code} revision ${g.revision}`).join(', ')
  const which = data.scope === 'unit' ? 'the unit listed above was' : 'the units listed above were'
  return `${data.shopName} certifies that ${which} built and tested to ${revisions}, following that revision’s released route, and passed every step of it. The values below are those recorded at production test, against the limits of that revision.`
}

export const SAFETY_NOTE =
  'The applicable safety standards and local codes govern the installation and use of these units. This certificate records the results of production tests; it does not certify the design against any standard. Hipot and load tests involve lethal voltages and are run by trained operators in interlocked fixtures.'

function summaryRows(group: CertificateGroup, step: CertificateGroup['steps'][number]): string[][] {
  return step.checks.map((check) => {
    const values = group.units
      .map((u) => u.runs.find((r) => r.stepId === step.id)?.values[check.id])
      .filter((v): v is CertificateValue => v !== undefined)
    const passed = values.filter((v) => v.isPass).length
    let measured: string
    const numbers = values.map((v) => v.number).filter((n): n is number => n !== null)
    if (check.kind === 'numeric' && numbers.length) {
      const lo = certificateValueWords(check, { ...values[0]!, number: Math.min(...numbers) })
      const hi = certificateValueWords(check, { ...values[0]!, number: Math.max(...numbers) })
      measured = lo === hi ? lo : `${lo.replace(` ${check.unit ?? ''}`, '')} to ${hi}`
    } else {
      const words = [...new Set(values.map((v) => certificateValueWords(check, v)))]
      measured = words.join(', ') || 'not recorded'
    }
    const label = check.derived ? `${check.label} (derived)` : check.label
    const result =
      values.length === group.units.length && passed === values.length
        ? `PASS, ${passed} of ${group.units.length}`
        : `${passed} of ${group.units.length} passed`
    return [label, limitWords(check), measured, result]
  })
}

function unitRows(group: CertificateGroup, unit: CertificateGroup['units'][number]): string[][] {
  const rows: string[][] = []
  for (const step of group.steps) {
    const run = unit.runs.find((r) => r.stepId === step.id)
    step.checks.forEach((check, i) => {
      const v = run?.values[check.id]
      const stepCell =
        i === 0
          ? `${step.position}. ${step.name}${run ? `\n${run.finishedOn}${run.attempt > 1 ? `, attempt ${run.attempt}` : ''}` : ''}`
          : ''
      rows.push([
        stepCell,
        check.derived ? `${check.label} (derived)` : check.label,
        limitWords(check),
        certificateValueWords(check, v),
        v ? resultWord(v.isPass) : '—',
      ])
    })
  }
  return rows
}

const SUMMARY_COLUMNS: Column[] = [
  { title: 'CHECK', width: 40 },
  { title: 'LIMITS', width: 26 },
  { title: 'MEASURED', width: 24, style: PAPER_STYLE.cellBold },
  { title: 'RESULT', width: 14 },
]
const UNIT_COLUMNS: Column[] = [
  { title: 'STEP', width: 20, style: PAPER_STYLE.cellBold },
  { title: 'CHECK', width: 34 },
  { title: 'LIMITS', width: 22 },
  { title: 'MEASURED', width: 17, style: PAPER_STYLE.cellBold },
  { title: 'RESULT', width: 8 },
]

function drawFirstHead(w: PaperWriter, data: CertificateData): void {
  w.firstHead(data.shopName, data.reference, 'Certificate of conformance')
  const products = data.groups.map((g) => `${g.product.code} ${g.product.name}`).join('; ')
  const lots = [...new Set(data.groups.flatMap((g) => g.units.map((u) => u.lotNumber)))]
  const units = data.groups.reduce((s, g) => s + g.units.length, 0)
  w.fields(
    [
      ['Customer', data.customer?.name ?? ''],
      ['Order', data.shipment?.orderRef ?? ''],
      ['Shipment', data.shipment ? `${data.shipment.number}, ${data.shipment.shippedOn}` : ''],
      ['Units', String(units)],
      ['Product', products, 2],
      ['Revision', data.groups.map((g) => g.revision).join(', ')],
      ['Lot', lots.join(', ')],
    ],
    4,
  )
}

/**
 * A certificate of conformance as an A4 PDF: who it is for, product, revision and lots, the
 * statement, the serials, each test step's checks with limits, measured values and result,
 * the issuing person and date, and the safety note. For a shipment, a per-unit record of every
 * value follows the summary.
 */
export async function certificatePdf(
  data: CertificateData,
  onProgress?: (fraction: number) => Promise<void> | void,
): Promise<Buffer> {
  if (!data.groups.some((g) => g.units.length))
    throw new RangeError('a certificate needs at least one unit')
  const { doc, w } = customerPaper(
    `Certificate of conformance ${data.reference}`,
    `${data.shopName} · Certificate of conformance ${data.reference}`,
    data.issuedAt,
  )
  w.newPage()
  drawFirstHead(w, data)
  w.y += 1 * MM
  w.paragraph(conformanceStatement(data), { ...PAPER_STYLE.body, size: 10 }, 3 * MM)

  const unitTotal = data.groups.reduce((s, g) => s + g.units.length, 0)
  let done = 0
  for (const group of data.groups) {
    const title = data.groups.length > 1 ? ` — ${group.product.code} rev ${group.revision}` : ''
    if (data.scope === 'shipment') {
      w.heading(`Serials${title}`)
      w.table(
        [
          { title: 'SERIAL', width: 34, style: PAPER_STYLE.cellBold },
          { title: 'LOT', width: 16 },
          { title: 'PASSED ITS ROUTE', width: 20 },
          { title: 'RESULT', width: 30 },
        ],
        group.units.map((u) => [
          u.serial,
          u.lotNumber,
          u.passedOn ?? '—',
          `passed all ${group.steps.length} steps`,
        ]),
      )
      for (const step of group.steps) {
        if (!step.checks.length) continue
        w.heading(`${step.position}. ${step.name}${title}`, 4 * MM)
        w.table(SUMMARY_COLUMNS, summaryRows(group, step), { keepHeadWith: 2 })
        if (HIGH_VOLTAGE_KINDS.includes(step.stationKind))
          w.paragraph(
            'High-voltage test: values recorded in an interlocked fixture; the applicable safety standard sets the test voltage, duration and limits.',
            PAPER_STYLE.small,
            0,
          )
      }
    }
    for (const unit of group.units) {
      w.heading(
        data.scope === 'unit'
          ? `Recorded values — ${unit.serial}, lot ${unit.lotNumber}`
          : `Unit record — ${unit.serial}, lot ${unit.lotNumber}`,
      )
      w.table(UNIT_COLUMNS, unitRows(group, unit), { keepHeadWith: 3 })
      done += 1
      await onProgress?.(done / unitTotal)
    }
  }

  // Who issues it, and the note that standards and codes govern use.
  const noteHeight = textHeight(doc, SAFETY_NOTE, PAPER_STYLE.body, SHEET_WIDTH - 6 * MM)
  w.need(noteHeight + 34 * MM)
  w.y += 6 * MM
  doc.rect(SHEET.margin, w.y, SHEET_WIDTH, noteHeight + 5 * MM).fill('#f4f4f4')
  drawText(doc, SAFETY_NOTE, SHEET.margin + 3 * MM, w.y + 2.5 * MM, PAPER_STYLE.body, {
    width: SHEET_WIDTH - 6 * MM,
  })
  w.y += noteHeight + 10 * MM
  w.fields(
    [
      ['Issued by', data.issuedBy],
      ['For', data.shopName],
      ['Date', data.issuedAt.toISOString().slice(0, 10)],
    ],
    3,
  )
  w.y += 6 * MM
  doc
    .moveTo(SHEET.margin, w.y)
    .lineTo(SHEET.margin + 60 * MM, w.y)
    .lineWidth(0.6)
    .strokeColor(INK.text)
    .stroke()
  drawLine(doc, 'Signature', SHEET.margin, w.y + 1.2 * MM, PAPER_STYLE.label)
  w.finish()
  return pdfBuffer(doc)
}
