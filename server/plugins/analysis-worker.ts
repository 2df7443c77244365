import { availableParallelism } from 'node:os'
import { setTimeout as sleep } from 'node:timers/promises'
import { isPostgres } from '../../db/dialect'
import { analysisQueueFor, analyzeInWorker } from '../utils/analysis-pool'
import { analysisRole, beat, claimTask, finishTask, POLL_MS, type ClaimedTask } from '../utils/analysis-remote'

// A worker machine (ANALYSIS_ROLE=worker, PostgreSQL): takes analyses other app servers queued and runs them on this
// server's worker threads, up to ANALYSIS_WORKER_TASKS at once (default: one per core), beating each task's
// heartbeat with the stage it is at, and writes the outcome back (server/utils/analysis-remote.ts).
const HEARTBEAT_MS = 1000

export default defineNitroPlugin((nitro) => {
  if (analysisRole() !== 'worker') return
  const capacity = Number(process.env.ANALYSIS_WORKER_TASKS) || Math.max(1, availableParallelism())
  let stopped = false
  // The tasks running here: stopping the server calls them off; their heartbeats end, and once they are 15 s old
  // another worker takes them.
  const running = new Set<AbortController>()
  nitro.hooks.hook('close', () => {
    stopped = true
    for (const controller of running) controller.abort(new Error('The worker server is stopping.'))
  })

  async function run(task: ClaimedTask): Promise<void> {
    const db = useDb()
    const ownerKey = `task:${task.id}`
    const controller = new AbortController()
    running.add(controller)
    const heartbeat = setInterval(() => {
      beat(db, task.id, analysisQueueFor(ownerKey).running[0]?.stage ?? null)
        .then((mine) => mine || controller.abort(new Error('The task was called off.')))
        .catch((error) => console.error('[analysis worker] heartbeat failed:', error))
    }, HEARTBEAT_MS)
    try {
      const options = { ownerKey, format: task.input.format, label: task.label, signal: controller.signal }
      const packed = await analyzeInWorker(task.input.text, task.input.params, options)
      await finishTask(db, task.id, { ok: packed })
    } catch (error) {
      if (!controller.signal.aborted) await finishTask(db, task.id, { error })
    } finally {
      clearInterval(heartbeat)
      running.delete(controller)
    }
  }

  async function loop(): Promise<void> {
    await databaseReady()
    if (!isPostgres(useDb())) {
      console.warn('[analysis worker] ANALYSIS_ROLE=worker needs PostgreSQL (DATABASE_URL); taking no queued tasks.')
      return
    }
    while (!stopped) {
      const task = running.size < capacity ? await claimTask(useDb()).catch((error) => console.error('[analysis worker] claim failed:', error)) : undefined
      if (!task) {
        await sleep(POLL_MS)
        continue
      }
      run(task).catch((error) => console.error('[analysis worker] task failed:', error))
    }
  }
  loop().catch((error) => console.error('[analysis worker] stopped:', error))
})
