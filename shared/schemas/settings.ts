import { z } from 'zod'
import { requiredText, wholeNumber } from './fields'

// The admin's workshop-wide settings; booking, cancellation and payment rules read them.
export const workshopSettingsSchema = z.object({
  workshopName: requiredText('Workshop name', 80),
  timeZone: z
    .string({ error: 'Time zone is required.' })
    .refine((zone) => {
      try {
        new Intl.DateTimeFormat('en', { timeZone: zone })
        return zone.includes('/') || zone === 'UTC'
      } catch {
        return false
      }
    }, { error: 'Use an IANA time zone such as Europe/Dublin.' }),
  bookingHorizonDays: wholeNumber('Booking horizon (days)', 1, 366),
  weeklyLimitMinutes: wholeNumber('Weekly limit per member (minutes)', 15, 10_080),
  freeCancellationHours: wholeNumber('Free cancellation until (hours before)', 0, 336),
  lateCancellationFeePercent: wholeNumber('Late cancellation fee (%)', 0, 100),
  paymentHoldMinutes: wholeNumber('Time to pay a booking (minutes)', 5, 240),
  paymentBufferPercent: wholeNumber('Buffer on the authorised amount (%)', 0, 100),
  pickupReminderDays: wholeNumber('Remind about uncollected parts after (days)', 1, 90),
})
export type WorkshopSettings = z.output<typeof workshopSettingsSchema>
export const workshopSettingsPatchSchema = workshopSettingsSchema.partial()

export const DEFAULT_WORKSHOP_SETTINGS: WorkshopSettings = {
  workshopName: 'Kerfbook workshop',
  timeZone: 'UTC',
  bookingHorizonDays: 28,
  weeklyLimitMinutes: 480,
  freeCancellationHours: 24,
  lateCancellationFeePercent: 50,
  paymentHoldMinutes: 30,
  paymentBufferPercent: 20,
  pickupReminderDays: 7,
}
