import { idParamSchema } from '#shared/schemas/auth'
import { listOpeningHours } from '../../../../services/catalog/opening-hours'

export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  return listOpeningHours(useDb(), id)
})
