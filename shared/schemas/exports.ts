import { z } from 'zod'

export const EXPORT_FORMATS = ['csv', 'xlsx'] as const
export type ExportFormat = (typeof EXPORT_FORMATS)[number]

/** `?format=csv|xlsx` of every export route; the lots export adds the Yield board's filters. */
export const ExportFormatQuery = z.object({
  format: z.enum(EXPORT_FORMATS, { error: 'choose csv or xlsx' }),
})
