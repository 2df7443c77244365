import { jobFileParamsSchema } from '#shared/schemas/jobs'
import { removeJobFile } from '../../../../services/job-files'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id, fileId } = readParamsAs(event, jobFileParamsSchema)
  await removeJobFile(useDb(), user, id, fileId)
  setResponseStatus(event, 204)
  return null
})
