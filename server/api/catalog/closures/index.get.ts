import { listClosures } from '../../../services/catalog/opening-hours'

// Closures still ahead (or going on); past ones stay in the database as history.
export default defineApiHandler(async (event) => {
  await requireUser(event)
  return listClosures(useDb(), { fromIso: new Date().toISOString() })
})
