import { reconcileUnfinishedCuts } from '../../../services/operations'

// Completes finishes whose card was captured but whose commit was lost, now (the scheduler does it every minute for
// finishes older than two minutes; this takes every one).
export default defineApiHandler(async (event) => {
  await requireRole(event, 'admin')
  const { finished, reopened } = await reconcileUnfinishedCuts(useDb(), 0)
  return { finished: finished.length, reopened }
})
