// Job state codes are stable (stored, sent by the API); the labels are what people read.
export const JOB_STATES = ['draft', 'submitted', 'changes_requested', 'approved', 'booked', 'cutting', 'cut', 'ready', 'collected', 'withdrawn', 'rejected', 'cancelled'] as const
export type JobState = (typeof JOB_STATES)[number]

export const JOB_STATE_LABELS: Record<JobState, string> = {
  draft: 'Draft',
  submitted: 'Waiting for review',
  changes_requested: 'Changes asked for',
  approved: 'Approved — ready to book',
  booked: 'Booked',
  cutting: 'On the machine',
  cut: 'Cut',
  ready: 'Ready to collect',
  collected: 'Collected',
  withdrawn: 'Withdrawn',
  rejected: 'Turned down',
  cancelled: 'Cancelled',
}

/** States in which the member may still change files and details. */
export const EDITABLE_JOB_STATES: readonly JobState[] = ['draft', 'changes_requested']
