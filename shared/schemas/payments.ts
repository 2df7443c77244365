import { z } from 'zod'
import { requiredText, wholeNumber } from './fields'

export const finishCutSchema = z.object({
  actualMinutes: z.number({ error: 'Actual minutes must be a number.' }).positive({ error: 'Actual minutes must be more than 0.' }).max(24 * 60, { error: 'At most 1440 minutes.' }),
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
