import { z } from 'zod'
import { requiredText, wholeNumber } from './fields'

export const finishCutSchema = z.object({
  // Absent: the timer's minutes are used.
  actualMinutes: z.number({ error: 'Actual minutes must be a number.' }).positive({ error: 'Actual minutes must be more than 0.' }).max(24 * 60, { error: 'At most 1440 minutes.' }).optional(),
  note: z.string().trim().max(1000).default(''),
})

export const refundSchema = z.object({
  amountMinor: wholeNumber('Refund amount', 1, 100_000_000).optional(),
  reason: requiredText('Reason', 500),
})

export const paymentListQuerySchema = z.object({
  from: z.iso.datetime({ offset: true }).optional(),
  to: z.iso.datetime({ offset: true }).optional(),
  state: z.enum(['awaiting', 'authorised', 'captured', 'refunded', 'partly-refunded', 'released', 'balance-due']).optional(),
  format: z.enum(['json', 'csv']).optional(),
})

export const problemSchema = z.object({
  kind: z.enum(['failed-cut', 're-cut', 'material-defect', 'other'], { error: 'Choose what went wrong.' }),
  note: requiredText('Note', 1000),
})

export const readySchema = z.object({ location: requiredText('Shelf or bin', 80) })

export const collectSchema = z.object({
  code: z.string({ error: 'Enter the pickup code.' }).trim().min(4, { error: 'Enter the pickup code.' }).max(20),
  // Staff saw that the member still owes a balance and hand the parts over anyway.
  handOverWithBalanceOwed: z.boolean().default(false),
})

export const runSheetQuerySchema = z.object({
  cutter: z.coerce.number().int().positive({ error: 'Choose a cutter.' }),
  date: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, { error: 'The date is YYYY-MM-DD.' }),
})
