import { defineStore } from 'pinia'
import type { Role, SessionUser } from '#shared/roles'
import type { LengthUnit } from '#shared/units'

// The signed-in user, shared by the layout, the route guard and every page.
export const useSessionStore = defineStore('session', {
  state: () => ({ user: null as (SessionUser & { lengthUnit?: LengthUnit }) | null, loaded: false }),
  getters: {
    signedIn: (state) => state.user !== null,
  },
  actions: {
    hasRole(...roles: Role[]) {
      return !!this.user && roles.includes(this.user.role)
    },
    async load() {
      try {
        this.user = await useRequestFetch()<SessionUser>('/api/me')
      } catch {
        this.user = null
      }
      this.loaded = true
    },
    async signIn(email: string, password: string) {
      this.user = await $fetch<SessionUser>('/api/auth/sign-in', { method: 'POST', body: { email, password } })
      // The person's own settings (the length unit) come with /api/me.
      await this.load()
    },
    async signOut() {
      await $fetch('/api/auth/sign-out', { method: 'POST' })
      this.user = null
      await useUserSession().clear().catch(() => undefined)
    },
  },
})
