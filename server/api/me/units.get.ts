import { lengthUnitOf } from '../../services/preferences'

// The unit the signed-in person reads lengths and areas in.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  return { lengthUnit: await lengthUnitOf(useDb(), user.id) }
})
