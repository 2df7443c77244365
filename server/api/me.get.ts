import { lengthUnitOf } from '../services/preferences'

export default defineApiHandler(async (event) => {
  const { id, email, name, role } = await requireUser(event)
  return { id, email, name, role, lengthUnit: await lengthUnitOf(useDb(), id) }
})
