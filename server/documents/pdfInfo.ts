/**
 * Document info that makes a pdfkit PDF a pure function of its input. pdfkit stamps
 * `new Date()` as CreationDate unless given one, and derives the trailer /ID from the info
 * dictionary (an MD5 of its values), so fixing every info entry fixes the /ID too. Font subset
 * tags come from the font's resource name (F1, F2, …) and streams from their bytes; nothing
 * else in pdfkit 0.20 reads the clock or a random source unless encryption is on. PNGs with an
 * alpha channel are avoided: their object numbers depend on timing (see qrVector.ts).
 * Files are stored under their sha256, so a job that runs twice must write the same bytes.
 */
export function fixedPdfInfo(title: string, issuedAt: Date): PDFKit.DocumentInfo {
  return {
    Title: title,
    Author: 'Waymark',
    Creator: 'Waymark',
    Producer: 'Waymark (pdfkit)',
    CreationDate: issuedAt,
    ModDate: issuedAt,
  }
}
