import { z } from 'zod'
import { requiredText, wholeNumber } from './fields'

// Cutting minutes: machine time spent cutting, without the setup (the cutter's setup minutes are charged on top, once).
const cuttingMinutes = z.number({ error: 'Cutting minutes must be a number.' }).positive({ error: 'Cutting minutes must be more than 0.' }).max(24 * 60, { error: 'At most 1440 minutes.' })

export const finishCutSchema = z.object({
  // Absent: the timer's minutes are used.
  actualMinutes: cuttingMinutes.optional(),
  note: z.string().trim().max(1000).default(''),
  // The charge staff confirmed on the finish form; when it no longer matches, nothing is captured (409).
  confirmedChargeMinor: z.number().int().nonnegative().optional(),
})

export const finishQuoteSchema = z.object({ actualMinutes: z.coerce.number().pipe(cuttingMinutes).optional() })

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
  // Without a cutter the day opens on the preferred one, or on the one with bookings that day.
  cutter: z.coerce.number().int().positive({ error: 'Choose a cutter.' }).optional(),
  prefer: z.coerce.number().int().positive().optional(),
  date: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, { error: 'The date is YYYY-MM-DD.' }),
})
