import { z } from 'zod'
import { listCutters } from '../../../services/catalog/cutters'

const querySchema = z.object({ includeRetired: z.enum(['true', 'false']).optional() })

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { includeRetired } = readQueryAs(event, querySchema)
  return listCutters(useDb(), { includeRetired: includeRetired === 'true' && user.role !== 'member' })
})
