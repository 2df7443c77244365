import { lengthUnitOf } from '../services/preferences'
import { liveSessionUser } from '../utils/sessions'

// nuxt-auth-utils' own GET /api/_auth/session answers from the cookie alone; an ended session must not show its
// user there either, and the pages read the account as it is now (a changed role or name) with the person's settings.
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    const sessionId = session.secure?.sessionId
    const userId = session.user?.id
    if (userId === undefined) return
    const user = sessionId ? await liveSessionUser(useDb(), sessionId, userId) : undefined
    if (user) {
      session.user = { ...user, lengthUnit: await lengthUnitOf(useDb(), user.id) }
      return
    }
    await clearUserSession(event)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Your session has ended. Please sign in again.' })
  })
})
