import { createHash } from 'node:crypto'
import jsQR from 'jsqr'
import { PDFParse } from 'pdf-parse'
import { PNG } from 'pngjs'
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest'
import { checkLimitWords, limitNumber } from '../../../../shared/recipes/limitText'
import { travelersPdf } from '../../../../server/documents/travelers'
import type { TravelerData } from '../../../../server/documents/travelers'
import { mod3736CheckCharacter } from '../../../../shared/checkCharacter'
import { unitUrl } from '../../../../shared/links'
import { HIGH_VOLTAGE_CAUTION } from '../../../../shared/safety/hipot'
import type { CheckDto, StepDto } from '../../../../shared/schemas/recipes'

const serialOf = (body: string) => body + mod3736CheckCharacter(body)
const SERIALS = ['FP24-2649-00017', 'FP24-2649-00018', 'FP24-2649-00019'].map(serialOf)
const BASE_URL = 'https://waymark.example.com'

function check(position: number, fields: Partial<CheckDto>): CheckDto {
  return {
    ...{ id: `check-${position}`, stepId: 'step', position, key: `k${position}`, label: 'Check' },
    ...{ kind: 'numeric', unit: null, nominal: null, lower: null, upper: null, decimals: 0 },
    ...{ choices: null, derived: null, derivedInputs: null, isKey: false, isForCustomers: true },
    ...fields,
  }
}

const winding: StepDto = {
  ...{ id: 'step-1', position: 1, name: 'Wind T1', stationKind: 'winding', instructions: '' },
  ...{ safetyNote: 'Trim wire ends away from the body.', requiresSignoff: false },
  checks: [
    check(1, { label: 'Primary inductance', unit: 'µH', lower: 81, upper: 135, nominal: 108 }),
    check(2, { label: 'Turn deviation', unit: 'turns', lower: -0.5, upper: 0.5, decimals: 1 }),
    check(3, { label: 'Sleeving fitted', kind: 'boolean' }),
  ],
}
winding.checks[1]!.derived = 'turn_deviation'
const hipot: StepDto = {
  ...{ id: 'step-2', position: 2, name: 'Hipot', stationKind: 'hipot', instructions: '' },
  ...{ safetyNote: 'Close the cage before starting.', requiresSignoff: true },
  checks: [
    check(4, { label: 'Leakage current', unit: 'mA', upper: 5, decimals: 1 }),
    check(5, { label: 'Insulation resistance', unit: 'MΩ', lower: 100 }),
    check(6, {
      label: 'Arc indicator',
      kind: 'choice',
      choices: [
        { value: 'correct', isPass: true },
        { value: 'arcing', isPass: false },
      ],
    }),
  ],
}

const data = (over: Partial<TravelerData> = {}): TravelerData => ({
  product: { code: 'FP24', name: 'FP-24350 push-pull converter' },
  revision: { letter: 'B' },
  lot: { number: 'L-0042', orderRef: 'PO-88123', customerName: 'Harbour Drives', dueDate: null },
  steps: [winding, hipot],
  units: SERIALS.map((serial) => ({ serial })),
  baseUrl: BASE_URL,
  issuedAt: new Date('2026-12-01T08:00:00Z'),
  ...over,
})

// pdf.js hands text back NFKC-normalised (µ comes back as Greek mu) and wrapped into lines.
const flat = (text: string) => text.normalize('NFKC').replace(/\s+/g, ' ')

async function pageTexts(pdf: Buffer): Promise<string[]> {
  const parser = new PDFParse({ data: pdf })
  try {
    return (await parser.getText()).pages.map((p) => flat(p.text))
  } finally {
    await parser.destroy()
  }
}

describe('travelersPdf', () => {
  let pdf: Buffer
  let texts: string[]
  const fractions: number[] = []

  beforeAll(async () => {
    pdf = await travelersPdf(data(), async (f) => {
      fractions.push(f)
    })
    texts = await pageTexts(pdf)
  })
  afterEach(() => vi.useRealTimers())

  it('prints one page per unit for a short route, each with its own serial', () => {
    expect(texts).toHaveLength(3)
    texts.forEach((text, i) => {
      expect(text).toContain(SERIALS[i])
      for (const other of SERIALS.filter((_, j) => j !== i)) expect(text).not.toContain(other)
    })
  })

  it('shows the header, the route with limits in words, and the sign-off boxes', () => {
    const text = texts[0]!
    for (const part of ['FP24', 'FP-24350 push-pull converter', 'Revision B', 'rev B', 'L-0042'])
      expect(text).toContain(part)
    expect(text).toContain('PO-88123')
    expect(text).toContain('Harbour Drives')
    expect(text).toContain('Due —')
    for (const part of ['Wind T1', 'Winding', 'Hipot · two-person']) expect(text).toContain(part)
    for (const words of ['81–135 µH (nom. 108)', '−0.5 to 0.5 turns', 'computed', 'max 5 mA'])
      expect(text).toContain(flat(words))
    for (const words of ['min 100 MΩ', 'tick when done', 'pass if: correct'])
      expect(text).toContain(flat(words))
    expect(text).toContain('Safety: Trim wire ends away from the body.')
    expect(text).toContain('Safety: Close the cage before starting.')
    expect(text.match(/Operator: signature, date/g)).toHaveLength(2)
    expect(text.match(/Second person: signature, date/g)).toHaveLength(1)
  })

  it('marks the hipot step with the high-voltage caution and names who governs', () => {
    for (const text of texts) {
      expect(text).toContain('HIGH VOLTAGE')
      expect(text).toContain(flat(HIGH_VOLTAGE_CAUTION))
      expect(text).toContain('applicable safety standard, local codes and licensed practice govern')
    }
  })

  it('carries a QR on the rendered page that decodes to the unit URL', async () => {
    const parser = new PDFParse({ data: pdf })
    try {
      const shot = await parser.getScreenshot({ partial: [2], scale: 2, imageDataUrl: false })
      const png = PNG.sync.read(Buffer.from(shot.pages[0]!.data))
      const pixels = new Uint8ClampedArray(png.data.buffer, png.data.byteOffset, png.data.length)
      expect(jsQR(pixels, png.width, png.height)?.data).toBe(unitUrl(BASE_URL, SERIALS[1]!))
    } finally {
      await parser.destroy()
    }
  })

  it('reports progress after each unit, ending at 1', () => {
    expect(fractions).toEqual([1 / 3, 2 / 3, 1])
  })

  it('gives byte-identical files for the same input, whatever the clock says', async () => {
    vi.useFakeTimers({ toFake: ['Date'] })
    vi.setSystemTime(new Date('2031-05-17T13:45:00Z'))
    const again = await travelersPdf(data())
    vi.useRealTimers()
    const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex')
    expect(sha(again)).toBe(sha(pdf))
    expect(again.equals(pdf)).toBe(true)
    const parser = new PDFParse({ data: pdf })
    const info = await parser.getInfo()
    await parser.destroy()
    expect(info.info?.CreationDate).toBe('D:20261201080000Z')
    const [first, second] = await Promise.all([travelersPdf(data()), travelersPdf(data())])
    expect(first.equals(pdf) && second.equals(pdf)).toBe(true)
    const later = await travelersPdf(data({ issuedAt: new Date('2026-12-02T08:00:00Z') }))
    expect(later.equals(pdf)).toBe(false)
  })

  it('continues a long route on a second sheet with the serial repeated', async () => {
    const steps = Array.from({ length: 8 }, () => [winding, hipot])
      .flat()
      .map((step, i) => ({ ...step, id: `s${i}`, position: i + 1 }))
    const long = await pageTexts(
      await travelersPdf(data({ steps, units: [{ serial: SERIALS[0]! }] })),
    )
    expect(long.length).toBeGreaterThan(1)
    long.forEach((text, i) => {
      expect(text).toContain(SERIALS[0])
      expect(text).toContain(`Sheet ${i + 1} of ${long.length}`)
    })
    expect(long.join(' ').match(/Operator: signature, date/g)).toHaveLength(16)
  })

  it('cuts a step taller than a page between its checks, signing off once at the end', async () => {
    const checks = Array.from({ length: 60 }, (_, i) =>
      check(100 + i, { label: `Pin ${i + 1} resistance`, unit: 'mΩ', upper: 20 }),
    )
    const steps = [{ ...winding, checks }]
    const pages = await pageTexts(await travelersPdf(data({ steps, units: [{ serial: 'X1' }] })))
    expect(pages.length).toBeGreaterThan(1)
    const all = pages.join(' ')
    for (let i = 1; i <= 60; i++)
      expect(all.match(new RegExp(`Pin ${i} resistance`, 'g'))).toHaveLength(1)
    expect(all.match(/Operator: signature, date/g)).toHaveLength(1)
    expect(pages[1]).toContain('Winding, continued')
  })

  it('refuses a lot without units', async () => {
    await expect(travelersPdf(data({ units: [] }))).rejects.toThrow(RangeError)
  })
})

describe('checkLimitWords', () => {
  const numeric = (fields: Partial<CheckDto>) => check(1, { unit: 'V', ...fields })
  it('words each kind of limit the way the floor reads it', () => {
    expect(checkLimitWords(numeric({ lower: 81, upper: 135, unit: 'µH' }))).toBe('81–135 µH')
    expect(checkLimitWords(numeric({ upper: 5, unit: 'mA', decimals: 2 }))).toBe('max 5 mA')
    expect(checkLimitWords(numeric({ lower: 85, unit: '%', decimals: 1 }))).toBe('min 85 %')
    expect(checkLimitWords(numeric({ lower: 92, upper: 92, unit: 'turns' }))).toBe(
      'exactly 92 turns',
    )
    expect(checkLimitWords(numeric({ lower: -2, upper: -1 }))).toBe('−2 to −1 V')
    expect(checkLimitWords(numeric({ nominal: 350 }))).toBe('record, in V (nom. 350)')
    expect(checkLimitWords(check(1, { kind: 'boolean' }))).toBe('tick when done')
    expect(checkLimitWords(check(1, { kind: 'text' }))).toBe('write it in')
    expect(checkLimitWords(hipot.checks[2]!)).toBe('pass if: correct')
  })

  it('rounds a limit to the check decimals and drops trailing zeros', () => {
    expect(limitNumber(346.55, 1)).toBe('346.6')
    expect(limitNumber(85, 2)).toBe('85')
    expect(limitNumber(-0.5, 1)).toBe('−0.5')
  })
})
