import { parse } from 'csv-parse/sync'
import { describe, expect, it } from 'vitest'
import { csvCell, safeText, writeCsv } from '../../../../server/csv'
import { FILE_NAME_MAX, safeFileName } from '../../../../server/services/receiving/uploads'

describe('the CSV guard', () => {
  // OWASP "CSV Injection": text starting with =, +, -, @, tab or CR gets a leading apostrophe.
  it.each(['=1+2', '+1', '-1', '@SUM(A1)', '\tx', '\rx', '=HYPERLINK("http://x","y")'])(
    'guards the text %j',
    (text) => {
      expect(safeText(text)).toBe(`'${text}`)
    },
  )

  it('leaves other text, numbers (negative too), times and nothing as they are', () => {
    expect(safeText('Ferncastle 1-2')).toBe('Ferncastle 1-2')
    expect(csvCell(-2)).toBe(-2)
    expect(csvCell(-0.125)).toBe(-0.125)
    expect(csvCell(null)).toBe('')
    expect(csvCell(new Date(Date.UTC(2026, 0, 2, 3, 4, 5)))).toBe('2026-01-02T03:04:05.000Z')
  })

  it('writes guarded text and bare numbers that read back as they were meant', () => {
    const text = writeCsv([
      ['name', 'value'],
      ['=cmd|x', -3.5],
    ])
    expect(text).toBe("name,value\r\n'=cmd|x,-3.5\r\n")
    expect(parse(text)).toEqual([
      ['name', 'value'],
      ["'=cmd|x", '-3.5'],
    ])
    expect(writeCsv([['a'], ['b']], 'unix')).toBe('a\nb\n')
  })
})

describe('safeFileName', () => {
  it('keeps only the base name, without controls, bidi overrides or leading dots', () => {
    expect(safeFileName('../../etc/passwd', 'f')).toBe('passwd')
    expect(safeFileName('C:\\Users\\me\\cert.pdf', 'f')).toBe('cert.pdf')
    expect(safeFileName('in\u0000voice\u0007\u009b.pdf', 'f')).toBe('invoice.pdf')
    expect(safeFileName('\u202Efdp.exe', 'f')).toBe('fdp.exe')
    expect(safeFileName(' ..hidden.pdf ', 'f')).toBe('hidden.pdf')
    expect(safeFileName('../', 'fallback.pdf')).toBe('fallback.pdf')
  })

  it('bounds the length in characters and keeps the extension', () => {
    const long = safeFileName(`${'é'.repeat(300)}.pdf`, 'f')
    expect(Array.from(long)).toHaveLength(FILE_NAME_MAX)
    expect(long.endsWith('é.pdf')).toBe(true)
    expect(Array.from(safeFileName('😀'.repeat(200), 'f'))).toHaveLength(FILE_NAME_MAX)
  })
})
