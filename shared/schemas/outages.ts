import { z } from 'zod'
import { idField, requiredText } from './fields'

const instant = (label: string) => z.iso.datetime({ offset: true, error: `${label} must be a date and time (ISO 8601).` })

// Staff mark a cutter out of service: from now (or a given start) until an expected return.
export const outageCreateSchema = z.object({
  cutterId: idField('cutter'),
  reason: requiredText('Reason', 300),
  start: instant('Start').optional(),
  expectedBackAt: instant('Expected back'),
})

export const outageChangeSchema = z.object({
  reason: requiredText('Reason', 300).optional(),
  expectedBackAt: instant('Expected back').optional(),
})

export type OutageCreateInput = z.infer<typeof outageCreateSchema>
export type OutageChangeInput = z.infer<typeof outageChangeSchema>
