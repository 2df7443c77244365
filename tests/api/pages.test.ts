import { $fetch, fetch, setup } from '@nuxt/test-utils/e2e'
import { describe, expect, inject, it } from 'vitest'

// The shared server from tests/setup/server.ts, reached through @nuxt/test-utils' e2e helpers.
await setup({ host: inject('baseUrl') })

describe('server-rendered shell', () => {
  it('renders the landing page with the product name and the safety note', async () => {
    const html = await $fetch<string>('/')
    expect(html).toContain('Kerfbook')
    expect(html).toContain('chlorine-bearing plastics')
  })

  it('renders a friendly 404 for an unknown page', async () => {
    const response = await fetch('/no-such-page', { headers: { accept: 'text/html' } })
    expect(response.status).toBe(404)
    expect(await response.text()).toContain('not on the workshop floor')
  })

  it('sends a visitor from a member page to sign-in', async () => {
    const response = await fetch('/account', { redirect: 'manual' })
    expect([301, 302, 307, 308]).toContain(response.status)
    expect(response.headers.get('location')).toContain('/sign-in')
  })
})
