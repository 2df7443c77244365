import { runSheetQuerySchema } from '#shared/schemas/payments'
import { runSheet } from '../services/run-sheet'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { cutter, date } = readQueryAs(event, runSheetQuerySchema)
  return runSheet(useDb(), cutter, date)
})
