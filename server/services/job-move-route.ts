import { reviewCommentSchema } from '#shared/schemas/jobs'
import { idParamSchema } from '#shared/schemas/auth'
import { requireUser } from '../utils/auth'
import { useDb } from '../utils/db'
import { defineApiHandler, readBodyAs, readParamsAs } from '../utils/handler'
import { moveJob } from './jobs'
import type { JobAction } from './job-states'

/** The handler of every "move this job" route: the state machine decides who may and queues the mail with the move. */
export function defineJobMoveHandler(action: Exclude<JobAction, 'submit' | 'book' | 'unbook'>) {
  return defineApiHandler(async (event) => {
    const user = await requireUser(event)
    const { id } = readParamsAs(event, idParamSchema)
    const { comment, findingRef } = await readBodyAs(event, reviewCommentSchema)
    return moveJob(useDb(), user, id, action, { comment, findingRef })
  })
}
