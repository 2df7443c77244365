import { releaseExpiredHolds } from '../../../services/payments'

// Frees slots whose payment time ran out now (the scheduler also does this every minute).
export default defineApiHandler(async (event) => {
  await requireRole(event, 'admin')
  return { released: await releaseExpiredHolds(useDb()) }
})
