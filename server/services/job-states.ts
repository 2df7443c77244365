import type { Knex } from 'knex'
import type { JobState } from '#shared/job-states'
import type { FindingRef } from '#shared/schemas/jobs'
import { JOB_STATE_LABELS } from '#shared/job-states'
import { isStaff, type SessionUser } from '#shared/roles'
import { Conflict, Forbidden, InvalidInput } from '../utils/errors'
import { nowIso } from '../utils/rows'
import { sendJobTransitionMail } from './job-mail'

// The one place that says how a job may move. `owner`: the member whose job it is; `staff`: staff or
// admin; `system`: other services (booking, payment), never a request directly.
type Mover = 'owner' | 'staff' | 'system'

interface Transition {
  from: readonly JobState[]
  to: JobState
  by: readonly Mover[]
  needsComment?: boolean
}

export const JOB_TRANSITIONS = {
  submit: { from: ['draft', 'changes_requested'], to: 'submitted', by: ['owner'] },
  approve: { from: ['submitted'], to: 'approved', by: ['staff'] },
  requestChanges: { from: ['submitted'], to: 'changes_requested', by: ['staff'], needsComment: true },
  reject: { from: ['submitted'], to: 'rejected', by: ['staff'], needsComment: true },
  withdraw: { from: ['draft', 'submitted', 'changes_requested', 'approved', 'booked'], to: 'withdrawn', by: ['owner'] },
  book: { from: ['approved'], to: 'booked', by: ['system'] },
  unbook: { from: ['booked'], to: 'approved', by: ['system'] },
  startCutting: { from: ['booked'], to: 'cutting', by: ['staff'] },
  finishCutting: { from: ['cutting'], to: 'cut', by: ['staff'] },
  markReady: { from: ['cut'], to: 'ready', by: ['staff'] },
  markCollected: { from: ['ready'], to: 'collected', by: ['staff'] },
  cancel: { from: ['approved', 'booked'], to: 'cancelled', by: ['staff'], needsComment: true },
} as const satisfies Record<string, Transition>

export type JobAction = keyof typeof JOB_TRANSITIONS

export interface TransitionOptions {
  comment?: string
  findingRef?: FindingRef
}

export interface TransitionRecord {
  jobId: number
  from: JobState
  to: JobState
  action: JobAction
}

function moverOf(actor: SessionUser | 'system', memberId: number): Mover[] {
  if (actor === 'system') return ['system']
  const movers: Mover[] = []
  if (actor.id === memberId) movers.push('owner')
  if (isStaff(actor)) movers.push('staff')
  return movers
}

/** Moves a job along an allowed transition and writes its audit row, inside the caller's transaction. */
export async function transitionJob(trx: Knex.Transaction, jobId: number, action: JobAction, actor: SessionUser | 'system', options: TransitionOptions = {}): Promise<TransitionRecord> {
  const transition: Transition = JOB_TRANSITIONS[action]
  const job = await trx('jobs').where({ id: jobId }).first('id', 'state', 'member_id')
  if (!job) throw new Conflict('This job no longer exists.')
  const from = job.state as JobState
  if (!moverOf(actor, job.member_id).some((m) => transition.by.includes(m))) {
    throw new Forbidden(`You can't ${describe(action)} this job.`)
  }
  if (!transition.from.includes(from)) {
    throw new Conflict(`A job that is "${JOB_STATE_LABELS[from]}" can't be ${describe(action, true)}.`, { state: from })
  }
  const comment = options.comment?.trim() ?? ''
  if (transition.needsComment && comment.length === 0) {
    throw new InvalidInput('Please say why: the member reads this comment.', { fields: { comment: 'A comment is required.' } })
  }
  const now = nowIso()
  const moved = await trx('jobs')
    .where({ id: jobId, state: from })
    .update({ state: transition.to, updated_at: now, ...(action === 'submit' ? { submitted_at: now } : {}) })
  // Another request moved the job between the read and this write (possible with several app servers on PostgreSQL).
  if (moved !== 1) throw new Conflict('This job changed a moment ago. Reload it and try again.')
  await trx('job_events').insert({
    job_id: jobId,
    actor_id: actor === 'system' ? null : actor.id,
    from_state: from,
    to_state: transition.to,
    comment,
    finding_ref_json: options.findingRef ? JSON.stringify(options.findingRef) : null,
  })
  const record = { jobId, from, to: transition.to, action }
  // The mail about the move is written in the same transaction (the outbox's sender delivers it).
  await sendJobTransitionMail(trx, record)
  return record
}

const ACTION_WORDS: Record<JobAction, [present: string, past: string]> = {
  submit: ['submit', 'submitted'],
  approve: ['approve', 'approved'],
  requestChanges: ['ask for changes to', 'sent back for changes'],
  reject: ['turn down', 'turned down'],
  withdraw: ['withdraw', 'withdrawn'],
  book: ['book', 'booked'],
  unbook: ['release the booking of', 'released'],
  startCutting: ['start cutting', 'started'],
  finishCutting: ['finish', 'finished'],
  markReady: ['mark ready', 'marked ready'],
  markCollected: ['mark collected', 'marked collected'],
  cancel: ['cancel', 'cancelled'],
}

function describe(action: JobAction, past = false): string {
  return ACTION_WORDS[action][past ? 1 : 0]
}

/** The actions the viewer could take on a job in its state, for the page's buttons. */
export function availableActions(state: JobState, viewer: SessionUser, memberId: number): JobAction[] {
  const movers = moverOf(viewer, memberId)
  return (Object.keys(JOB_TRANSITIONS) as JobAction[]).filter((action) => {
    const transition: Transition = JOB_TRANSITIONS[action]
    return transition.from.includes(state) && transition.by.some((m) => movers.includes(m))
  })
}
