import { z } from 'zod'
import { listProcessSettings } from '../../../services/catalog/process-settings'

const querySchema = z.object({ cutterId: z.coerce.number().int().positive().optional(), materialId: z.coerce.number().int().positive().optional() })

export default defineApiHandler(async (event) => {
  await requireUser(event)
  return listProcessSettings(useDb(), readQueryAs(event, querySchema))
})
