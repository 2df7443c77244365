import { cuttingOverview } from '../../services/catalog/overview'

export default defineApiHandler(async (event) => {
  await requireUser(event)
  return cuttingOverview(useDb())
})
