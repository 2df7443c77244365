import { z } from 'zod'
import { idField, requiredText } from './fields'

const instant = (label: string) => z.iso.datetime({ offset: true, error: `${label} must be a date and time (ISO 8601).` })

export const bookingCreateSchema = z.object({
  jobId: idField('job'),
  cutterId: idField('cutter'),
  start: instant('Start'),
})

export const blockCreateSchema = z.object({
  cutterId: idField('cutter'),
  start: instant('Start'),
  end: instant('End'),
  reason: requiredText('Reason', 300),
})

export const bookingMoveSchema = z.object({
  start: instant('Start'),
  end: instant('End').optional(),
  reason: z.string().trim().max(500).optional(),
})

export const bookingCancelSchema = z.object({ reason: z.string().trim().max(500).default('') })

export const bookingRangeQuerySchema = z
  .object({
    cutter: z.coerce.number().int().positive().optional(),
    from: instant('from'),
    to: instant('to'),
    mine: z.enum(['true', 'false']).optional(),
  })
  .refine((q) => Date.parse(q.to) > Date.parse(q.from), { error: '"to" must be after "from".', path: ['to'] })
  .refine((q) => Date.parse(q.to) - Date.parse(q.from) <= 62 * 86_400_000, { error: 'Ask for at most 62 days at a time.', path: ['to'] })

export const suggestionQuerySchema = z.object({ jobId: z.coerce.number().int().positive({ error: 'Choose a job.' }) })
