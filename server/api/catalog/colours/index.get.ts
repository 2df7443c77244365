import { listColours } from '../../../services/catalog/colours'

export default defineApiHandler(async (event) => {
  await requireUser(event)
  return listColours(useDb())
})
