import { jobFileParamsSchema } from '#shared/schemas/jobs'
import { replaceJobFile } from '../../../../../../services/job-files'
import { jobForViewer } from '../../../../../../services/jobs'

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id, fileId } = readParamsAs(event, jobFileParamsSchema)
  // Whose job it is comes first: a stranger gets 404 before anything is read or validated.
  await jobForViewer(useDb(), user, id)
  const upload = await readCutFileUpload(event)
  const revision = await replaceJobFile(useDb(), user, id, fileId, upload)
  setResponseStatus(event, 201)
  return { fileId, revision }
})
