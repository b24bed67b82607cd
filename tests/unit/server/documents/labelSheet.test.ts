import jsQR from 'jsqr'
import { PDFParse } from 'pdf-parse'
import { PNG } from 'pngjs'
import { beforeAll, describe, expect, it, vi } from 'vitest'
import {
  LABEL_LAYOUTS,
  SAFE_MARGIN_MM,
  labelOrigin,
  labelSheetPdf,
} from '../../../../server/documents/labelSheet'
import type { LabelLayout } from '../../../../server/documents/labelSheet'
import { MM } from '../../../../server/documents/pdf'
import { mod3736CheckCharacter } from '../../../../shared/checkCharacter'
import { unitUrl } from '../../../../shared/links'

const BASE_URL = 'https://waymark.example.com'
const SERIALS = Array.from({ length: 30 }, (_, i) => {
  const body = `FP24-2649-${String(17 + i).padStart(5, '0')}`
  return body + mod3736CheckCharacter(body)
})
const SERIAL_PATTERN = /FP24-2649-\d{5}[0-9A-Z]/g

const run = (layout: LabelLayout, onProgress?: (f: number) => void) =>
  labelSheetPdf(
    {
      productCode: 'FP24',
      lotNumber: 'L-0042',
      serials: SERIALS,
      baseUrl: BASE_URL,
      layout,
      issuedAt: new Date('2026-12-01T08:00:00Z'),
    },
    onProgress,
  )

async function pageTexts(pdf: Buffer): Promise<string[]> {
  const parser = new PDFParse({ data: pdf })
  try {
    return (await parser.getText()).pages.map((p) => p.text)
  } finally {
    await parser.destroy()
  }
}

const SCALE = 3

async function renderPage(pdf: Buffer, page: number): Promise<PNG> {
  const parser = new PDFParse({ data: pdf })
  try {
    const shot = await parser.getScreenshot({ partial: [page], scale: SCALE, imageDataUrl: false })
    return PNG.sync.read(Buffer.from(shot.pages[0]!.data))
  } finally {
    await parser.destroy()
  }
}

/** Decodes the QR inside label `index`'s rectangle of a rendered page. */
function decodeLabel(png: PNG, layout: LabelLayout, index: number): string | undefined {
  const stock = LABEL_LAYOUTS[layout]
  const origin = labelOrigin(stock, index)
  const [x, y] = [Math.round(origin.x * SCALE), Math.round(origin.y * SCALE)]
  const [w, h] = stock.labelMm.map((mm) => Math.round(mm * MM * SCALE)) as [number, number]
  const crop = new Uint8ClampedArray(w * h * 4)
  for (let row = 0; row < h; row++) {
    const from = ((y + row) * png.width + x) * 4
    crop.set(png.data.subarray(from, from + w * 4), row * w * 4)
  }
  return jsQR(crop, w, h)?.data
}

/** Pixels with ink closer to a label edge than the safe margin (less a pixel of anti-aliasing). */
function inkInMargins(png: PNG, layout: LabelLayout): number {
  const stock = LABEL_LAYOUTS[layout]
  const [pageW, pageH] = stock.pageMm
  const [w, h] = stock.labelMm
  const left = (pageW - stock.columns * w) / 2
  const top = (pageH - stock.rows * h) / 2
  const margin = SAFE_MARGIN_MM - 25.4 / (72 * SCALE)
  let ink = 0
  for (let py = 0; py < png.height; py++)
    for (let px = 0; px < png.width; px++) {
      const xMm = (px + 0.5) / (SCALE * MM) - left
      const yMm = (py + 0.5) / (SCALE * MM) - top
      const inX = ((xMm % w) + w) % w
      const inY = ((yMm % h) + h) % h
      const isMargin = Math.min(inX, w - inX, inY, h - inY) < margin
      if (isMargin && png.data[(py * png.width + px) * 4]! < 200) ink++
    }
  return ink
}

describe('labelSheetPdf on A4 3 × 8 stock', () => {
  let pdf: Buffer
  let texts: string[]
  const fractions: number[] = []

  beforeAll(async () => {
    pdf = await run('a4_3x8', (f) => void fractions.push(f))
    texts = await pageTexts(pdf)
  })

  it('puts 24 labels on page 1 and the other 6 on page 2, in order', () => {
    expect(texts).toHaveLength(2)
    expect(texts[0]!.match(SERIAL_PATTERN)).toEqual(SERIALS.slice(0, 24))
    expect(texts[1]!.match(SERIAL_PATTERN)).toEqual(SERIALS.slice(24))
    expect(texts[0]!.match(/Lot L-0042/g)).toHaveLength(24)
    expect(texts[0]!.match(/^FP24$/gm)).toHaveLength(24)
  })

  it('centres the 70 × 37 mm grid on the sheet', () => {
    const stock = LABEL_LAYOUTS.a4_3x8
    expect(stock.label).toBe('A4 sheet, 3 × 8 labels (70 × 37 mm)')
    expect(labelOrigin(stock, 0).x).toBeCloseTo(0)
    expect(labelOrigin(stock, 0).y).toBeCloseTo(0.5 * MM)
    const last = labelOrigin(stock, 23)
    expect(last.x + 70 * MM).toBeCloseTo(210 * MM)
    expect(297 * MM - (last.y + 37 * MM)).toBeCloseTo(0.5 * MM)
    expect(labelOrigin(stock, 24)).toEqual(labelOrigin(stock, 0))
  })

  it('prints a QR in each label that decodes to that unit, inside the safe margin', async () => {
    const first = await renderPage(pdf, 1)
    for (const i of [0, 1, 2, 10, 21, 23])
      expect(decodeLabel(first, 'a4_3x8', i)).toBe(unitUrl(BASE_URL, SERIALS[i]!))
    expect(decodeLabel(await renderPage(pdf, 2), 'a4_3x8', 28)).toBe(
      unitUrl(BASE_URL, SERIALS[28]!),
    )
    expect(inkInMargins(first, 'a4_3x8')).toBe(0)
  })

  it('reports progress after each page, ending at 1', () => {
    expect(fractions).toEqual([24 / 30, 1])
  })

  it('gives byte-identical files for the same input, whatever the clock says', async () => {
    vi.useFakeTimers({ toFake: ['Date'] })
    vi.setSystemTime(new Date('2031-05-17T13:45:00Z'))
    try {
      expect((await run('a4_3x8')).equals(pdf)).toBe(true)
      // Runs interleaved on one event loop, as two workers' jobs would be.
      const runs = await Promise.all([run('a4_3x8'), run('a4_3x8'), run('thermal_50x25')])
      expect(runs[0].equals(pdf) && runs[1].equals(pdf)).toBe(true)
      expect(runs[2].equals(await run('thermal_50x25'))).toBe(true)
    } finally {
      vi.useRealTimers()
    }
  })
})

describe('labelSheetPdf on a 50 × 25 mm thermal roll', () => {
  it('prints one page per serial with its QR, keeping the safe margin', async () => {
    const fractions: number[] = []
    const pdf = await run('thermal_50x25', (f) => void fractions.push(f))
    const texts = await pageTexts(pdf)
    expect(texts).toHaveLength(30)
    texts.forEach((text, i) => expect(text.match(SERIAL_PATTERN)).toEqual([SERIALS[i]]))
    expect(fractions).toHaveLength(30)
    expect(fractions.at(-1)).toBe(1)
    expect(fractions).toEqual([...fractions].sort((a, b) => a - b))
    const seventh = await renderPage(pdf, 7)
    expect(decodeLabel(seventh, 'thermal_50x25', 6)).toBe(unitUrl(BASE_URL, SERIALS[6]!))
    expect(inkInMargins(seventh, 'thermal_50x25')).toBe(0)
    expect(LABEL_LAYOUTS.thermal_50x25.label).toBe('Thermal roll, 50 × 25 mm')
  })

  it('refuses an empty run', async () => {
    await expect(
      labelSheetPdf({
        ...{ productCode: 'FP24', lotNumber: 'L-1', serials: [], baseUrl: BASE_URL },
        ...{ layout: 'thermal_50x25', issuedAt: new Date(0) },
      }),
    ).rejects.toThrow(RangeError)
  })
})
