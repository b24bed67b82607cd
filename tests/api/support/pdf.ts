import { PDFParse } from 'pdf-parse'
import type { TestClient } from './client'

/** pdf.js hands text back NFKC-normalised (µ comes back as Greek mu) and wrapped into lines. */
export const flat = (text: string) => text.normalize('NFKC').replace(/\s+/g, ' ')

/** A PDF's whole text on one line, as `flat` gives it. */
export async function pdfText(pdf: Buffer): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(pdf) })
  try {
    return flat((await parser.getText()).text)
  } finally {
    await parser.destroy()
  }
}

/** A binary download read whole (supertest buffers only text by default). */
export function binary(req: ReturnType<TestClient['get']>) {
  return req.buffer(true).parse((res, done) => {
    const chunks: Buffer[] = []
    res.on('data', (c: Buffer) => chunks.push(c))
    res.on('end', () => done(null, Buffer.concat(chunks)))
  })
}
