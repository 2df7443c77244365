import { describe, expect, it } from 'vitest'
import { client, signedIn } from './helpers'

describe('bad input gets a clear 400, never a 500', () => {
  it('malformed JSON', async () => {
    const response = await client().raw('POST', '/api/auth/sign-in', '{"email": "member@example.test", "password": ')
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(/not valid JSON/)
  })

  it('schema-invalid sign-up names each field', async () => {
    const response = await client().post('/api/auth/sign-up', { name: '', email: 'not-an-email', password: 'short' })
    expect(response.status).toBe(400)
    expect(Object.keys(response.body.data.fields).sort()).toEqual(['email', 'name', 'password'])
    expect(response.body.message).toMatch(/password: Use at least 10 characters/)
  })

  it('wrong types and unknown roles', async () => {
    expect((await client().post('/api/auth/sign-in', { email: 42, password: ['x'] })).status).toBe(400)
    const admin = await signedIn('admin@example.test')
    const bad = await admin.patch('/api/admin/users/1', { role: 'overlord' })
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields.role).toMatch(/member, staff, admin/)
    expect((await admin.patch('/api/admin/users/not-a-number', { role: 'staff' })).status).toBe(400)
    expect((await admin.patch('/api/admin/users/999999', { role: 'staff' })).status).toBe(404)
  })

  it('a damaged verification token', async () => {
    const response = await client().post('/api/auth/verify', { token: '<script>' })
    expect(response.status).toBe(400)
  })
})
