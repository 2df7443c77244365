import { runSheetQuerySchema } from '#shared/schemas/payments'
import { runSheet } from '../services/run-sheet'

export default defineApiHandler(async (event) => {
  await requireRole(event, 'staff', 'admin')
  const { cutter, prefer, date } = readQueryAs(event, runSheetQuerySchema)
  return runSheet(useDb(), { cutterId: cutter, preferredCutterId: prefer }, date)
})
