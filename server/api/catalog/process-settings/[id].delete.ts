import { idParamSchema } from '#shared/schemas/auth'
import { deleteProcessSetting } from '../../../services/catalog/process-settings'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  await deleteProcessSetting(useDb(), id)
  setResponseStatus(event, 204)
  return null
})
