import { z } from 'zod'
import { text } from './common'
import { STATION_CODE_MAX_LENGTH, STATION_KINDS, STATION_NAME_MAX_LENGTH } from '../stations'
import type { StationKind } from '../stations'

export const StationCreateInput = z.object({
  code: text()
    .trim()
    .toUpperCase()
    .min(2, 'use 2 to 16 characters')
    .max(STATION_CODE_MAX_LENGTH, 'use 2 to 16 characters')
    .regex(/^[A-Z0-9][A-Z0-9-]*$/, 'use letters, digits and hyphens'),
  name: text().trim().min(1, 'enter a name').max(STATION_NAME_MAX_LENGTH),
  kind: z.enum(STATION_KINDS, { error: 'choose a station kind' }),
  isActive: z.boolean().optional(),
})
export type StationCreateInput = z.infer<typeof StationCreateInput>

export const StationUpdateInput = StationCreateInput.partial()
export type StationUpdateInput = z.infer<typeof StationUpdateInput>

export interface StationDto {
  id: string
  code: string
  name: string
  kind: StationKind
  isActive: boolean
  createdAt: string
  updatedAt: string
}
