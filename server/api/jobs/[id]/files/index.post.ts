import { idParamSchema } from '#shared/schemas/auth'
import { fileQuantityField } from '#shared/schemas/jobs'
import { z } from 'zod'
import { addJobFile } from '../../../../services/job-files'
import { jobForViewer } from '../../../../services/jobs'

const fieldsSchema = z.object({ quantity: z.coerce.number().pipe(fileQuantityField).default(1) })

export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  // Whose job it is comes first: a stranger gets 404 before anything is read or validated.
  await jobForViewer(useDb(), user, id)
  const upload = await readCutFileUpload(event)
  const { quantity } = fieldsSchema.parse(upload.fields)
  const fileId = await addJobFile(useDb(), user, id, upload, quantity)
  setResponseStatus(event, 201)
  return { fileId }
})
