import { describe, expect, it } from 'vitest'
import { nextStep } from '../../shared/job-state-steps'
import { JOB_STATES } from '../../shared/job-states'
import { availableActions } from '../../server/services/job-states'

describe('nextStep', () => {
  it('gives every state a sentence for the member and for the staff, naming who acts', () => {
    for (const state of JOB_STATES) {
      for (const viewer of ['member', 'staff'] as const) {
        const step = nextStep(state, viewer)
        expect(step.text.length, `${state} for ${viewer}`).toBeGreaterThan(20)
        expect(step.heading).toBeTruthy()
      }
    }
  })

  it('says "your move" where the state machine gives that viewer the next move, and "closed" only where nobody has one', () => {
    const member = { id: 1, email: 'm@example.test', name: 'M', role: 'member' as const }
    const staff = { id: 2, email: 's@example.test', name: 'S', role: 'staff' as const }
    for (const state of JOB_STATES) {
      // Review, and the machine's steps up to the shelf, are the staff's to take.
      if (availableActions(state, staff, member.id).some((a) => ['approve', 'reject', 'requestChanges', 'startCutting', 'finishCutting', 'markReady'].includes(a))) expect(nextStep(state, 'staff').actor, state).toBe('you')
      if (availableActions(state, member, member.id).includes('submit')) expect(nextStep(state, 'member').actor).toBe('you')
      if (nextStep(state, 'member').actor === 'nobody') expect(availableActions(state, member, member.id)).toEqual([])
    }
  })
})
