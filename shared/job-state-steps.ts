import type { JobState } from './job-states'

/** Who moves a job on from its state: the person looking at it, the member, the staff, or nobody (closed). */
export type NextActor = 'you' | 'member' | 'staff' | 'nobody'

export interface NextStep {
  actor: NextActor
  /** One or two sentences: what happens next and who does it. */
  text: string
}

type Viewer = 'member' | 'staff'

const STEPS: Record<JobState, Record<Viewer, NextStep>> = {
  draft: {
    member: { actor: 'you', text: 'Add your files, give a reason for any group of warnings, then submit the job for review.' },
    staff: { actor: 'member', text: 'The member is still preparing it. It comes to the review queue once they submit it.' },
  },
  submitted: {
    member: { actor: 'staff', text: 'The staff review your files next. They approve the job or ask for changes, and you get an e-mail either way. Until then you can still withdraw it.' },
    staff: { actor: 'you', text: 'Waiting for your review: approve it, ask the member for changes, or turn it down.' },
  },
  changes_requested: {
    member: { actor: 'you', text: 'The staff asked for changes (their comment is in the history). Upload corrected revisions, then submit the job again.' },
    staff: { actor: 'member', text: 'Waiting for the member to upload corrected files and submit again.' },
  },
  approved: {
    member: { actor: 'you', text: 'Approved. Book a slot on the calendar; your card is held for the estimate when you book, and charged only for the minutes cut.' },
    staff: { actor: 'member', text: 'Approved. Waiting for the member to book a slot and pay the hold on their card.' },
  },
  booked: {
    member: { actor: 'staff', text: 'Booked. The staff cut it in your slot; you can cancel the booking under My bookings.' },
    staff: { actor: 'you', text: 'Booked. Start the cut from the run sheet when its slot comes.' },
  },
  cutting: {
    member: { actor: 'staff', text: 'On the machine now. The staff finish it and charge the minutes actually cut.' },
    staff: { actor: 'you', text: 'On the machine. Finish and charge it from the run sheet.' },
  },
  cut: {
    member: { actor: 'staff', text: 'Cut. The staff put the parts on a shelf; you get an e-mail with your pickup code.' },
    staff: { actor: 'you', text: 'Cut. Put the parts on a shelf and mark them ready for pickup on the run sheet.' },
  },
  ready: {
    member: { actor: 'you', text: 'Collect your parts at the desk: show the pickup code at the top of this page.' },
    staff: { actor: 'member', text: 'On the shelf. Hand the parts over when the member shows their pickup code.' },
  },
  collected: {
    member: { actor: 'nobody', text: 'Collected. Nothing more to do on this job.' },
    staff: { actor: 'nobody', text: 'Collected. Nothing more to do on this job.' },
  },
  withdrawn: {
    member: { actor: 'nobody', text: 'Withdrawn. Nothing more happens to it; start a new job to cut these files.' },
    staff: { actor: 'nobody', text: 'Withdrawn by the member. Nothing more happens to it.' },
  },
  rejected: {
    member: { actor: 'nobody', text: 'The staff turned this job down; their reason is in the history. Start a new job to try again.' },
    staff: { actor: 'nobody', text: 'Turned down. Nothing more happens to it.' },
  },
  cancelled: {
    member: { actor: 'nobody', text: 'Cancelled. Nothing more happens to it.' },
    staff: { actor: 'nobody', text: 'Cancelled. Nothing more happens to it.' },
  },
}

const ACTOR_WORDS: Record<NextActor, string> = { you: 'Your move', member: 'Waiting for the member', staff: 'Waiting for the staff', nobody: 'Closed' }

/** What happens next to a job in `state`, said to its member or to the staff. */
export function nextStep(state: JobState, viewer: Viewer): NextStep & { heading: string } {
  const step = STEPS[state][viewer]
  return { ...step, heading: ACTOR_WORDS[step.actor] }
}
