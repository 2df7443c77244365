import { processSettingSchema } from '#shared/schemas/catalog'
import { createProcessSetting } from '../../../services/catalog/process-settings'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const input = await readBodyAs(event, processSettingSchema)
  setResponseStatus(event, 201)
  return createProcessSetting(useDb(), input)
})
