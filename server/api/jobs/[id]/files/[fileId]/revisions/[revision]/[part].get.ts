import { revisionPartParamsSchema } from '#shared/schemas/jobs'
import { revisionPayload } from '../../../../../../../services/job-revisions'

// GET …/geometry and …/sites: the revision's packed preview geometry or finding sites
// (shared/packed-analysis.ts: decodeGeometry, decodeSites), as stored; authorised as the job is.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id, fileId, revision, part } = readParamsAs(event, revisionPartParamsSchema)
  return sendImmutablePacked(event, await revisionPayload(useDb(), user, id, fileId, revision, part))
})
