import { sessionIsLive } from '../utils/sessions'

// nuxt-auth-utils' own GET /api/_auth/session answers from the cookie alone; an ended session must not
// show its user there either.
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    const sessionId = (session.secure as { sessionId?: string } | undefined)?.sessionId
    const userId = (session.user as { id?: number } | undefined)?.id
    if (userId === undefined) return
    if (sessionId && (await sessionIsLive(useDb(), sessionId, userId))) return
    await clearUserSession(event)
    throw createError({ statusCode: 401, statusMessage: 'Unauthorized', message: 'Your session has ended. Please sign in again.' })
  })
})
