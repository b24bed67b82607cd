import { z } from 'zod'
import { text } from './common'
import { ALERT_STATUSES } from '../quality/alerts'
import type { AlertDetails, AlertRule, AlertStatus } from '../quality/alerts'

/** Query of `GET /api/alerts`: one lot's, or every lot's, optionally of one status. */
export const AlertQuery = z.object({
  lotId: text().uuid('not a valid id').optional(),
  status: z.enum(ALERT_STATUSES, 'open or acknowledged').optional(),
})
export type AlertQuery = z.infer<typeof AlertQuery>

/** One quality alert as the alerts panel shows it. */
export interface AlertDto {
  id: string
  lotId: string
  lotNumber: string
  stepId: string
  stepName: string
  rule: AlertRule
  checkId: string | null
  checkLabel: string | null
  checkUnit: string | null
  details: AlertDetails
  /** What tripped, in one line (the same words as the e-mail). */
  headline: string
  status: AlertStatus
  acknowledgedBy: { id: string; name: string } | null
  acknowledgedAt: string | null
  createdAt: string
}
