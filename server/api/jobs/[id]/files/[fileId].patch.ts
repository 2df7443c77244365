import { jobFileParamsSchema, jobFileUpdateSchema } from '#shared/schemas/jobs'
import { setJobFileQuantity } from '../../../../services/job-files'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id, fileId } = readParamsAs(event, jobFileParamsSchema)
  const { quantity } = await readBodyAs(event, jobFileUpdateSchema)
  await setJobFileQuantity(useDb(), user, id, fileId, quantity)
  return { ok: true }
})
