import { idParamSchema } from '#shared/schemas/auth'
import { overrideSchema } from '#shared/schemas/jobs'
import { recordOverride } from '../../../services/jobs'

// Staff let one job through a limit (e.g. an intentionally thin bridge), with the reason on record.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const { reason } = await readBodyAs(event, overrideSchema)
  await recordOverride(useDb(), staff, id, reason)
  return { ok: true }
})
