import { paymentListQuerySchema } from '#shared/schemas/payments'
import { listPayments, listPaymentsPage, paymentTotals } from '../../services/payment-list'

// Every booking's payment with its ledger, in pages with `limit`; `format=csv` gives the whole table as a file.
export default defineApiHandler(async (event) => {
  await requireRole(event, 'admin')
  const { format, limit, cursor, ...filter } = readQueryAs(event, paymentListQuerySchema)
  // The first page carries the totals of everything the filter selects.
  if (format !== 'csv' && limit) return { ...(await listPaymentsPage(useDb(), filter, { limit, cursor })), totals: cursor ? undefined : await paymentTotals(useDb(), filter) }
  const payments = await listPayments(useDb(), filter)
  if (format !== 'csv') return payments
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', 'attachment; filename="kerfbook-payments.csv"')
  return toCsv(
    ['booking', 'job', 'member', 'start', 'state', 'authorised_minor', 'captured_minor', 'refunded_minor', 'currency'],
    payments.map((p) => [p.bookingId, p.jobTitle, p.memberName, p.start, p.state, p.authorisedMinor, p.capturedMinor, p.refundedMinor, p.currency]),
  )
})
