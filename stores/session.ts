import { defineStore } from 'pinia'
import type { Role } from '#shared/roles'
import type { LengthUnit } from '#shared/units'

// The signed-in user for the layout, the route guard and every page. nuxt-auth-utils holds it (useUserSession):
// fetched once while the server renders the first page, from GET /api/_auth/session, which
// server/plugins/session-check.ts answers only for a live session and fills with the account's current data.
// This store adds the role test and signing in and out; it keeps no copy of its own.
export const useSessionStore = defineStore('session', () => {
  const auth = useUserSession()
  const user = computed(() => auth.user.value)
  const signedIn = computed(() => auth.loggedIn.value)
  const loaded = computed(() => auth.ready.value)

  function hasRole(...roles: Role[]) {
    return !!user.value && roles.includes(user.value.role)
  }

  /** Reads the session again (after something on the server signed this browser in, e.g. a confirmed e-mail). */
  async function load() {
    await auth.fetch()
  }

  async function signIn(email: string, password: string) {
    await $fetch('/api/auth/sign-in', { method: 'POST', body: { email, password } })
    await auth.fetch()
  }

  async function signOut() {
    await $fetch('/api/auth/sign-out', { method: 'POST' })
    signedOut()
  }

  /** The server has ended this browser's session already (signed out everywhere). */
  function signedOut() {
    auth.session.value = null
  }

  function setLengthUnit(unit: LengthUnit) {
    if (auth.user.value) auth.user.value.lengthUnit = unit
  }

  return { user, signedIn, loaded, hasRole, load, signIn, signOut, signedOut, setLengthUnit }
})
