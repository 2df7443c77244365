import { idParamSchema } from '#shared/schemas/auth'
import { startCut } from '../../../services/operations'

// The cut begins: the job goes on the machine and the timer starts on server time.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  return startCut(useDb(), staff, id)
})
