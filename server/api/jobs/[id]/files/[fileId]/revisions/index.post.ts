import { jobFileParamsSchema } from '#shared/schemas/jobs'
import { replaceJobFile } from '../../../../../../services/job-files'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id, fileId } = readParamsAs(event, jobFileParamsSchema)
  const upload = await readCutFileUpload(event)
  const revision = await replaceJobFile(useDb(), user, id, fileId, upload)
  setResponseStatus(event, 201)
  return { fileId, revision }
})
