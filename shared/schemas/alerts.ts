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

/** Body of `POST /api/alerts/acknowledge`: every open alert, or every open alert of one lot. */
export const AcknowledgeAlertsInput = z.object({
  lotId: text().uuid('not a valid id').optional(),
})
export type AcknowledgeAlertsInput = z.infer<typeof AcknowledgeAlertsInput>

/** What `POST /api/alerts/acknowledge` did: how many alerts it acknowledged, and which. */
export interface AlertsAcknowledgedDto {
  acknowledged: number
  ids: string[]
}

/** One quality alert as the alerts panel shows it. */
export interface AlertDto {
  id: string
  lotId: string
  lotNumber: string
  stepId: string
  stepName: string
  /** The first rule broken (as stored in `rule`). */
  rule: AlertRule
  /** Every rule broken in the episode. */
  rules: AlertRule[]
  checkId: string | null
  checkLabel: string | null
  checkUnit: string | null
  details: AlertDetails
  /** What happened and what to look at, in plain words (the e-mail's first line). */
  summary: string
  /** The statistics in one line (the same words as the e-mail). */
  headline: string
  status: AlertStatus
  /** The series is back in control: the episode is over (a new one may be raised). */
  isBackInControl: boolean
  endedAt: string | null
  acknowledgedBy: { id: string; name: string } | null
  acknowledgedAt: string | null
  createdAt: string
}
