import { revisionParamsSchema } from '#shared/schemas/jobs'
import { revisionAnalysis } from '../../../../../../services/job-revisions'

// One revision's figures and finding groups; its geometry and sites have routes of their own.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id, fileId, revision } = readParamsAs(event, revisionParamsSchema)
  return revisionAnalysis(useDb(), user, id, fileId, revision)
})
