import { workshopSettingsPatchSchema } from '#shared/schemas/settings'
import { updateWorkshopSettings } from '../../services/settings'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'admin')
  return updateWorkshopSettings(useDb(), await readBodyAs(event, workshopSettingsPatchSchema))
})
