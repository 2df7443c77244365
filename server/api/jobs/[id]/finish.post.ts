import { idParamSchema } from '#shared/schemas/auth'
import { finishCutSchema } from '#shared/schemas/payments'
import { finishCut } from '../../../services/operations'

// Staff log the minutes actually cut (or take the timer's); the card hold is captured for exactly what they cost.
export default defineApiHandler(async (event) => {
  const staff = await requireRole(event, 'staff', 'admin')
  const { id } = readParamsAs(event, idParamSchema)
  const input = await readBodyAs(event, finishCutSchema)
  // The receipts (the charge, and any balance still to pay) are written with the ledger entries they report.
  const { settlement } = await finishCut(useDb(), staff, id, input.actualMinutes, input.note, input.confirmedChargeMinor)
  return settlement
})
