import type { Knex } from 'knex'
import { JOB_STATE_LABELS } from '#shared/job-states'
import { serverConfig } from '../utils/config'
import { sendMail } from './mail-outbox'
import type { TransitionRecord } from './job-states'
import { findingRefLabel } from './job-revisions'

interface MailPlan {
  toStaff?: boolean
  subject: (title: string) => string
  lines: (title: string, memberName: string, comment: string) => string[]
}

// Who hears about which move, and what they are told. Queued in the transition's own transaction (job-states.ts).
const PLANS: Partial<Record<TransitionRecord['action'], MailPlan>> = {
  submit: {
    toStaff: true,
    subject: (t) => `New job to review: ${t}`,
    lines: (t, m, c) => [`${m} submitted "${t}" for review.`, c],
  },
  approve: {
    subject: (t) => `Approved: ${t}`,
    lines: (t) => [`Your job "${t}" is approved.`, 'You can now book a slot on the cutter.'],
  },
  requestChanges: {
    subject: (t) => `Changes asked for: ${t}`,
    lines: (t, _m, c) => [`The staff looked at "${t}" and ask for changes before it can be cut:`, c, 'Upload corrected files on the job page and submit it again.'],
  },
  reject: {
    subject: (t) => `Not accepted: ${t}`,
    lines: (t, _m, c) => [`The staff can't accept "${t}" for cutting:`, c],
  },
  withdraw: {
    toStaff: true,
    subject: (t) => `Withdrawn: ${t}`,
    lines: (t, m) => [`${m} withdrew "${t}".`],
  },
  cancel: {
    subject: (t) => `Cancelled: ${t}`,
    lines: (t, _m, c) => [`Your job "${t}" was cancelled by the staff:`, c],
  },
  startCutting: { subject: (t) => `Cutting now: ${t}`, lines: (t) => [`"${t}" is on the machine.`] },
  finishCutting: { subject: (t) => `Cut: ${t}`, lines: (t) => [`"${t}" has been cut.`] },
  markCollected: { subject: (t) => `Collected: ${t}`, lines: (t) => [`Thanks for collecting "${t}".`] },
}

export async function sendJobTransitionMail(db: Knex, record: TransitionRecord): Promise<void> {
  const plan = PLANS[record.action]
  if (!plan) return
  const job = await db('jobs as j').join('users as u', 'u.id', 'j.member_id').where('j.id', record.jobId).first('j.title', 'u.name', 'u.email')
  const event = await db('job_events').where({ job_id: record.jobId, to_state: record.to }).orderBy('id', 'desc').first('comment', 'finding_ref_json')
  const finding = await findingRefLabel(db, record.jobId, event?.finding_ref_json ? JSON.parse(event.finding_ref_json) : null)
  // Withdrawing a draft concerns nobody else.
  if (record.action === 'withdraw' && record.from === 'draft') return
  const recipients = plan.toStaff
    ? (await db('users').whereIn('role', ['staff', 'admin']).whereNull('disabled_at').select('email')).map((u) => u.email as string)
    : [job.email as string]
  const url = `${serverConfig().appUrl}/jobs/${record.jobId}`
  for (const to of recipients) {
    await sendMail({
      to,
      subject: plan.subject(job.title),
      paragraphs: [...plan.lines(job.title, job.name, event?.comment ?? ''), finding ? `About: ${finding}.` : '', `Now: ${JOB_STATE_LABELS[record.to]}.`].filter(Boolean),
      action: { label: 'Open the job', url },
    }, db)
  }
}
