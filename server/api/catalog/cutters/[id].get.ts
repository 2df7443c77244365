import { idParamSchema } from '#shared/schemas/auth'
import { getCutter } from '../../../services/catalog/cutters'

export default defineApiHandler(async (event) => {
  await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  return getCutter(useDb(), id)
})
