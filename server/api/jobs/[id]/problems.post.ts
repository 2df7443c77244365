import { idParamSchema } from '#shared/schemas/auth'
import { problemSchema } from '#shared/schemas/payments'
import { reportProblem } from '../../../services/operations'

export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const { kind, note } = await readBodyAs(event, problemSchema)
  await reportProblem(useDb(), staff, id, kind, note)
  setResponseStatus(event, 201)
  return { ok: true }
})
