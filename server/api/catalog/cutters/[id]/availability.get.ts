import { z } from 'zod'
import { idParamSchema } from '#shared/schemas/auth'
import { cutterAvailability } from '../../../../services/bookings'

const rangeSchema = z.object({ from: z.iso.datetime({ offset: true }), to: z.iso.datetime({ offset: true }) })

// Opening periods and closures in a range, in UTC, for the calendar's shading.
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const { from, to } = readQueryAs(event, rangeSchema)
  return cutterAvailability(useDb(), id, new Date(from).toISOString(), new Date(to).toISOString())
})
