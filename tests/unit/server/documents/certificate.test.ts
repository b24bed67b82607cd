import { PDFParse } from 'pdf-parse'
import { beforeAll, describe, expect, it } from 'vitest'
import {
  certificatePdf,
  certificateValueWords,
  SAFETY_NOTE,
} from '../../../../server/documents/certificate'
import type {
  CertificateCheck,
  CertificateData,
  CertificateRun,
  CertificateValue,
} from '../../../../server/documents/certificate'
import { packingSlipPdf } from '../../../../server/documents/packingSlip'

const flat = (text: string) => text.normalize('NFKC').replace(/\s+/g, ' ')

async function pdfText(pdf: Buffer): Promise<{ text: string; pages: number }> {
  const parser = new PDFParse({ data: pdf })
  try {
    const result = await parser.getText()
    return { text: flat(result.text), pages: result.pages.length }
  } finally {
    await parser.destroy()
  }
}

function check(id: string, fields: Partial<CertificateCheck>): CertificateCheck {
  return {
    ...{ id, key: id, label: id, kind: 'numeric', unit: null, nominal: null },
    ...{ lower: null, upper: null, decimals: 0, choices: null, derived: null },
    ...fields,
  }
}
const num = (n: number, isPass = true): CertificateValue => ({
  number: n,
  text: null,
  boolean: null,
  isPass,
  isDerived: false,
})

const volts = check('hv', { label: 'Test voltage applied', unit: 'V', lower: 1700, upper: 1800 })
const seconds = check('hs', { label: 'Time held', unit: 's', lower: 60, upper: 65 })
const leakage = check('hl', { label: 'Highest leakage current', unit: 'mA', upper: 5, decimals: 2 })
const insulation = check('ir', { label: 'Insulation resistance', unit: 'MΩ', lower: 100 })
const vout = check('vo', {
  label: 'Output voltage',
  unit: 'V',
  lower: 345,
  upper: 355,
  decimals: 1,
})
const tick = check('tk', { label: 'Label matches', kind: 'boolean' })

// Readings as a hipot tester and a load rack would give them (invented values).
const readings = [
  { serial: 'FP24-2649-00017Q', hv: 1712, hs: 61, hl: 0.84, ir: 950, vo: 350.42 },
  { serial: 'FP24-2649-00018R', hv: 1705, hs: 60, hl: 1.07, ir: 880, vo: 349.61 },
]

const data: CertificateData = {
  shopName: 'Ferncastle Power',
  reference: 'S-0042',
  scope: 'shipment',
  issuedAt: new Date('2026-12-02T09:30:00Z'),
  issuedBy: 'Priya Venn',
  customer: { name: 'Halden Rail Systems', address: 'Wharf Road' },
  shipment: { number: 'S-0042', orderRef: 'HRS-4471', shippedOn: '2026-12-02' },
  groups: [
    {
      product: { code: 'FP24', name: 'FP-24350 push-pull converter' },
      revision: 'B',
      steps: [
        {
          id: 'h',
          position: 3,
          name: 'Hipot',
          stationKind: 'hipot',
          checks: [volts, seconds, leakage, insulation],
        },
        { id: 'l', position: 4, name: 'Load test', stationKind: 'load_test', checks: [vout] },
        {
          id: 'i',
          position: 5,
          name: 'Final inspection',
          stationKind: 'inspection',
          checks: [tick],
        },
      ],
      units: readings.map((r, i) => ({
        serial: r.serial,
        lotNumber: 'L-0001',
        passedOn: '2026-11-20',
        runs: <CertificateRun[]>[
          {
            stepId: 'h',
            attempt: i === 1 ? 2 : 1,
            finishedOn: '2026-11-19',
            values: { hv: num(r.hv), hs: num(r.hs), hl: num(r.hl), ir: num(r.ir) },
          },
          { stepId: 'l', attempt: 1, finishedOn: '2026-11-20', values: { vo: num(r.vo) } },
          {
            stepId: 'i',
            attempt: 1,
            finishedOn: '2026-11-20',
            values: {
              tk: { number: null, text: null, boolean: true, isPass: true, isDerived: false },
            },
          },
        ],
      })),
    },
  ],
}

// Rendering embeds fonts and takes seconds on a shared, busy machine.
describe('certificatePdf', { timeout: 30_000 }, () => {
  let pdf: Buffer
  let text: string
  const fractions: number[] = []

  beforeAll(async () => {
    pdf = await certificatePdf(data, (f) => void fractions.push(f))
    text = (await pdfText(pdf)).text
  }, 30_000)

  it('names product, revision, lot, customer, order, date and the issuing person', () => {
    for (const words of [
      'Certificate of conformance',
      'FP24 FP-24350 push-pull converter',
      'L-0001',
      'Halden Rail Systems',
      'HRS-4471',
      '2026-12-02',
      'Priya Venn',
    ])
      expect(text).toContain(words)
  })

  it('states the units were built and tested to the named revision, and that codes govern use', () => {
    expect(text).toContain(
      'Ferncastle Power certifies that the units listed above were built and tested to FP24 revision B',
    )
    expect(text).toContain(flat(SAFETY_NOTE))
  })

  it('prints every recorded value rounded to its check, with limits and result', () => {
    // Each reading above, rounded to the check's decimals (common practice, no source).
    for (const r of readings) {
      expect(text).toContain(r.serial)
      expect(text).toContain(`${r.hv} V`)
      expect(text).toContain(`${r.hs} s`)
      expect(text).toContain(`${r.hl.toFixed(2)} mA`)
      expect(text).toContain(`${r.ir} MΩ`)
      expect(text).toContain(`${r.vo.toFixed(1)} V`)
    }
    expect(text).toContain('1700–1800 V') // hipot voltage limits
    expect(text).toContain('60–65 s') // hipot duration limits
    expect(text).toContain('max 5 mA')
    expect(text).toContain('min 100 MΩ')
    expect(text).toContain('PASS, 2 of 2')
    expect(text).toContain('attempt 2') // the rework run is the one that counts, and says so
    // The summary gives the spread over the shipment: 1705 to 1712 V.
    expect(text).toContain('1705 to 1712 V')
  })

  it('reports progress per unit and embeds Roboto Condensed', () => {
    expect(fractions).toEqual([0.5, 1])
    expect(pdf.toString('latin1')).toMatch(/\/FontName \/[A-Z]{6}\+RobotoCondensed/)
  })

  it('is the same bytes for the same data, so a rerun stores the same file', async () => {
    expect(Buffer.compare(await certificatePdf(data), pdf)).toBe(0)
  })

  it('words values by kind', () => {
    expect(certificateValueWords(vout, num(350.46))).toBe('350.5 V')
    expect(certificateValueWords(tick, { ...num(0), number: null, boolean: false })).toBe('no')
    expect(certificateValueWords(vout, undefined)).toBe('not recorded')
  })

  it('for one serial, says "the unit" and lists its values without a shipment summary', async () => {
    const one = await certificatePdf({
      ...data,
      scope: 'unit',
      reference: readings[0]!.serial,
      groups: [{ ...data.groups[0]!, units: [data.groups[0]!.units[0]!] }],
    })
    const t = (await pdfText(one)).text
    expect(t).toContain('the unit listed above was built and tested to FP24 revision B')
    expect(t).toContain('350.4 V')
    expect(t).not.toContain('349.6 V')
  })
})

describe('packingSlipPdf', { timeout: 30_000 }, () => {
  it('lists ship-to, order, carrier, tracking and every serial with a count', async () => {
    const serials = Array.from(
      { length: 40 },
      (_, i) => `FP24-2649-${String(i + 1).padStart(5, '0')}X`,
    )
    const pdf = await packingSlipPdf({
      shopName: 'Ferncastle Power',
      shipment: {
        number: 'S-0042',
        orderRef: 'HRS-4471',
        carrier: 'Tarn Valley Freight',
        tracking: 'TVF 1',
        shippedOn: '2026-12-02',
      },
      customer: { name: 'Halden Rail Systems', address: 'Unit 4 Wharf Road\nHD7 2QX' },
      units: serials.map((serial) => ({
        serial,
        productCode: 'FP24',
        productName: 'Converter',
        revision: 'B',
        lotNumber: 'L-0001',
      })),
      packedBy: 'Dev Okafor',
      issuedAt: new Date('2026-12-02T09:30:00Z'),
    })
    const { text, pages } = await pdfText(pdf)
    for (const words of [
      'Packing slip',
      'Halden Rail Systems',
      'HD7 2QX',
      'HRS-4471',
      'Tarn Valley Freight',
      'TVF 1',
      'Dev Okafor',
    ])
      expect(text).toContain(words)
    for (const s of serials) expect(text).toContain(s)
    expect(text).toContain('40 FP24 rev B')
    expect(pages).toBe(2) // 40 rows run onto a second page, which repeats the table head
    expect(text).toContain('Page 2 of 2')
  })
})
