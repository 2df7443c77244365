import { z } from 'zod'
import { jobForViewer } from '../../../../services/jobs'
import { sheetSvg } from '../../../../services/run-sheet'

const paramsSchema = z.object({ id: z.coerce.number().int().positive(), sheet: z.coerce.number().int().min(1, { error: 'Sheets count from 1.' }) })

// Sheet n of the job's layout as an SVG file for the cutter.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id, sheet } = readParamsAs(event, paramsSchema)
  const job = await jobForViewer(useDb(), staff, id)
  const svg = await sheetSvg(useDb(), job, sheet - 1)
  setResponseHeader(event, 'content-type', 'image/svg+xml; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="job-${id}-sheet-${sheet}.svg"`)
  return svg
})
