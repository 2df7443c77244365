import { idParamSchema } from '#shared/schemas/auth'
import { jobForViewer } from '../../../services/jobs'
import { pickupQrSvg } from '../../../services/pickup-mail'
import { NotFound } from '../../../utils/errors'

// The member's own pickup code and QR code while the parts wait; staff never read codes, they ask for them.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readParamsAs(event, idParamSchema)
  const job = (await jobForViewer(useDb(), user, id)) as Awaited<ReturnType<typeof jobForViewer>> & {
    pickup_code: string | null
    pickup_location: string | null
  }
  if (job.member_id !== user.id || job.state !== 'ready' || !job.pickup_code) throw new NotFound('There is no pickup code for this job.')
  return { code: job.pickup_code, location: job.pickup_location, qrSvg: await pickupQrSvg(job.pickup_code) }
})
