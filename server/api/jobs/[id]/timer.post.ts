import { z } from 'zod'
import { idParamSchema } from '#shared/schemas/auth'
import { pauseOrResume } from '../../../services/operations'

const bodySchema = z.object({ action: z.enum(['pause', 'resume'], { error: 'The action is pause or resume.' }) })

export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const { action } = await readBodyAs(event, bodySchema)
  return pauseOrResume(useDb(), staff, id, action)
})
