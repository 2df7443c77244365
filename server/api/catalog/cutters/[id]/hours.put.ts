import { idParamSchema } from '#shared/schemas/auth'
import { openingHoursSchema } from '#shared/schemas/catalog'
import { replaceOpeningHours } from '../../../../services/catalog/opening-hours'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const input = await readBodyAs(event, openingHoursSchema)
  return replaceOpeningHours(useDb(), id, input)
})
