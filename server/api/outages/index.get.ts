import { openOutages } from '../../services/cutter-outages'

// Out-of-service periods under way or ahead, for the staff's overview.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  return openOutages(useDb())
})
