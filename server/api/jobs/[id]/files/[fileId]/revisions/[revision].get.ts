import { revisionParamsSchema } from '#shared/schemas/jobs'
import { revisionAnalysis } from '../../../../../../services/jobs'

// One revision's analysis with the preview geometry.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id, fileId, revision } = readParamsAs(event, revisionParamsSchema)
  return revisionAnalysis(useDb(), user, id, fileId, revision)
})
