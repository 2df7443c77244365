import { idParamSchema } from '#shared/schemas/auth'
import { processSettingPatchSchema } from '#shared/schemas/catalog'
import { updateProcessSetting } from '../../../services/catalog/process-settings'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const change = await readBodyAs(event, processSettingPatchSchema)
  return updateProcessSetting(useDb(), id, change)
})
