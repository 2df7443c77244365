import { z } from 'zod'
import { listMaterials } from '../../../services/catalog/materials'

const querySchema = z.object({ includeArchived: z.enum(['true', 'false']).optional() })

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { includeArchived } = readQueryAs(event, querySchema)
  return listMaterials(useDb(), { includeArchived: includeArchived === 'true' && user.role !== 'member' })
})
