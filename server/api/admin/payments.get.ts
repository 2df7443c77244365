import { paymentListQuerySchema } from '#shared/schemas/payments'
import { listPayments } from '../../services/payments'

// Every booking's payment with its ledger; `format=csv` gives the table as a file.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'admin')
  const { format, ...filter } = readQueryAs(event, paymentListQuerySchema)
  const payments = await listPayments(useDb(), filter)
  if (format !== 'csv') return payments
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', 'attachment; filename="kerfbook-payments.csv"')
  return toCsv(
    ['booking', 'job', 'member', 'start', 'state', 'authorised_minor', 'captured_minor', 'refunded_minor', 'currency'],
    payments.map((p) => [p.bookingId, p.jobTitle, p.memberName, p.start, p.state, p.authorisedMinor, p.capturedMinor, p.refundedMinor, p.currency]),
  )
})
