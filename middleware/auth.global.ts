import type { Role } from '#shared/roles'

declare module '#app' {
  interface PageMeta {
    /** Roles that may open the page; absent means any signed-in user. */
    roles?: Role[]
    /** Open to visitors who are not signed in. */
    public?: boolean
  }
}

// Hides pages a role may not see. The server's requireRole is what actually protects the data.
export default defineNuxtRouteMiddleware(async (to) => {
  // The server already ran this guard for the first page (and rendered its error page if it refused);
  // running it again while the browser hydrates would throw the same error a second time.
  const nuxtApp = useNuxtApp()
  if (import.meta.client && nuxtApp.isHydrating && nuxtApp.payload.serverRendered) return
  const session = useSessionStore()
  if (!session.loaded) await session.load()
  // Unknown addresses fall through to the 404 page rather than to sign-in.
  if (to.meta.public || to.matched.length === 0) return
  if (!session.user) return navigateTo({ path: '/sign-in', query: { next: to.fullPath } })
  if (to.meta.roles && !session.hasRole(...to.meta.roles)) {
    throw createError({ statusCode: 403, statusMessage: to.meta.roles.includes('staff') ? 'This page is for workshop staff.' : 'This page is for admins.' })
  }
})
