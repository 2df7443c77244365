import { lengthUnitSchema } from '#shared/units'
import { setLengthUnit } from '../../services/preferences'

// Lengths and areas in millimetres or inches, on every screen for this person; storage stays millimetres.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { lengthUnit } = await readBodyAs(event, lengthUnitSchema)
  return { lengthUnit: await setLengthUnit(useDb(), user.id, lengthUnit) }
})
