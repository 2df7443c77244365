import { jobFileParamsSchema, jobFileUpdateSchema } from '#shared/schemas/jobs'
import { setJobFileQuantity } from '../../../../services/job-files'
import { jobForViewer } from '../../../../services/jobs'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id, fileId } = readParamsAs(event, jobFileParamsSchema)
  // Whose job it is comes first: a stranger gets 404 before anything is read or validated.
  await jobForViewer(useDb(), user, id)
  const { quantity } = await readBodyAs(event, jobFileUpdateSchema)
  await setJobFileQuantity(useDb(), user, id, fileId, quantity)
  return { ok: true }
})
