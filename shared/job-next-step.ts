import type { JobState } from './job-states'

/** Who moves a job on next, and what they do: the member's overview shows it beside each open job. */
export interface JobNextStep {
  who: 'you' | 'staff'
  text: string
  /** Where the member acts, when it is theirs to act. */
  action?: { label: string; to: string; external?: boolean }
}

export interface NextStepJob {
  id: number
  state: JobState
  cutterName: string
  booking: { status: 'held' | 'confirmed'; payUrl: string | null; startText: string } | null
  pickupLocation: string | null
}

export function jobNextStep(job: NextStepJob): JobNextStep | null {
  const open = { label: 'Open the job', to: `/jobs/${job.id}` }
  switch (job.state) {
    case 'draft':
      return { who: 'you', text: 'Add your files and submit the job for review.', action: open }
    case 'changes_requested':
      return { who: 'you', text: 'Change the files as the staff asked, then submit again.', action: open }
    case 'submitted':
      return { who: 'staff', text: 'The staff review your files.' }
    case 'approved':
      return { who: 'you', text: `Book a time on ${job.cutterName}.`, action: { label: 'Book a time', to: `/calendar?job=${job.id}` } }
    case 'booked':
      if (job.booking?.status === 'held') {
        return { who: 'you', text: `Pay to keep your time (${job.booking.startText}).`, action: job.booking.payUrl ? { label: 'Pay now', to: job.booking.payUrl, external: true } : { label: 'Your bookings', to: '/bookings' } }
      }
      return { who: 'staff', text: `Cut with you at ${job.booking?.startText ?? 'your booked time'} on ${job.cutterName}.` }
    case 'cutting':
      return { who: 'staff', text: `On ${job.cutterName} now.` }
    case 'cut':
      return { who: 'staff', text: 'The staff put your parts on the pickup shelf.' }
    case 'ready':
      return { who: 'you', text: `Collect your parts${job.pickupLocation ? ` from ${job.pickupLocation}` : ''} with your pickup code.`, action: { label: 'Show the pickup code', to: `/jobs/${job.id}` } }
    default:
      return null
  }
}
