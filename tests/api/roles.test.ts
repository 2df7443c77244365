import { describe, expect, it } from 'vitest'
import { client, signedIn } from './helpers'

describe('roles', () => {
  it('guards a staff route: anonymous 401, member 403, staff 200', async () => {
    expect((await client().get('/api/staff/members')).status).toBe(401)
    expect((await (await signedIn('member@example.test')).get('/api/staff/members')).status).toBe(403)
    const staff = await (await signedIn('staff@example.test')).get('/api/staff/members')
    expect(staff.status).toBe(200)
    expect(staff.body.every((u: { role: string }) => u.role === 'member')).toBe(true)
  })

  it('lets only an admin change a role, and the change takes effect at once', async () => {
    const admin = await signedIn('admin@example.test')
    const staff = await signedIn('staff@example.test')
    const users = (await admin.get('/api/admin/users')).body as { id: number; email: string }[]
    const priya = users.find((u) => u.email === 'priya@example.test')!

    expect((await staff.patch(`/api/admin/users/${priya.id}`, { role: 'staff' })).status).toBe(403)
    const priyaClient = await signedIn('priya@example.test')
    expect((await priyaClient.get('/api/staff/members')).status).toBe(403)

    const promoted = await admin.patch(`/api/admin/users/${priya.id}`, { role: 'staff' })
    expect(promoted.status).toBe(200)
    expect(promoted.body.role).toBe('staff')
    // A role change ends the account's sessions; the next sign-in carries the new role.
    expect((await priyaClient.get('/api/staff/members')).status).toBe(401)
    const promotedClient = await signedIn('priya@example.test')
    expect((await promotedClient.get('/api/staff/members')).status).toBe(200)
    await admin.patch(`/api/admin/users/${priya.id}`, { role: 'member' })
    expect((await promotedClient.get('/api/staff/members')).status).toBe(401)
    expect((await (await signedIn('priya@example.test')).get('/api/staff/members')).status).toBe(403)
  })

  it('disabling an account ends its session; an admin cannot disable themselves', async () => {
    const admin = await signedIn('admin@example.test')
    const users = (await admin.get('/api/admin/users')).body as { id: number; email: string }[]
    const me = users.find((u) => u.email === 'admin@example.test')!
    expect((await admin.patch(`/api/admin/users/${me.id}`, { disabled: true })).status).toBe(409)

    const juno = users.find((u) => u.email === 'member@example.test')!
    const junoClient = await signedIn('member@example.test')
    expect((await admin.patch(`/api/admin/users/${juno.id}`, { disabled: true })).status).toBe(200)
    expect((await junoClient.get('/api/me')).status).toBe(401)
    expect((await client().post('/api/auth/sign-in', { email: 'member@example.test', password: 'kerfbook-demo' })).status).toBe(401)
    expect((await admin.patch(`/api/admin/users/${juno.id}`, { disabled: false })).status).toBe(200)
    expect((await client().post('/api/auth/sign-in', { email: 'member@example.test', password: 'kerfbook-demo' })).status).toBe(200)
  })
})
