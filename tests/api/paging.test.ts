// The list routes through HTTP: `limit` turns a list into pages that chain by `nextCursor`, a damaged cursor is a
// 400 with a sentence, and the routes still answer with the whole list without `limit` (the pages that have not moved on).
import { beforeAll, describe, expect, it } from 'vitest'
import { signedIn } from './helpers'

let staff: Awaited<ReturnType<typeof signedIn>>
let admin: Awaited<ReturnType<typeof signedIn>>
let member: Awaited<ReturnType<typeof signedIn>>
const titles = ['Paging: one', 'Paging: two', 'Paging: three']
const jobIds: number[] = []

beforeAll(async () => {
  ;[staff, admin, member] = await Promise.all([signedIn('staff@example.test'), signedIn('admin@example.test'), signedIn('priya@example.test')])
  const cutter = (await member.get('/api/catalog/overview')).body.find((c: { name: string }) => c.name.startsWith('Heron'))
  const materialId = cutter.materials.find((m: { name: string }) => m.name === 'Birch plywood').materialId
  for (const title of titles) jobIds.push((await member.post('/api/jobs', { title, cutterId: cutter.cutterId, materialId })).body.id)
})

describe('paged list routes', () => {
  it('chain a member’s jobs, newest first, by nextCursor to the last page', async () => {
    const whole = (await member.get('/api/jobs')).body as { id: number }[]
    expect(Array.isArray(whole)).toBe(true)
    const seen: number[] = []
    let path = '/api/jobs?order=newest&limit=2'
    for (;;) {
      const page = await member.get(path)
      expect(page.status).toBe(200)
      expect(page.body.items.length).toBeLessThanOrEqual(2)
      seen.push(...page.body.items.map((j: { id: number }) => j.id))
      if (!page.body.nextCursor) break
      path = `/api/jobs?order=newest&limit=2&cursor=${page.body.nextCursor}`
    }
    expect(seen.slice(0, 3)).toEqual([...jobIds].reverse())
    expect([...seen].sort()).toEqual(whole.map((j) => j.id).sort())
  })

  it('answer a damaged cursor or a page too large with 400 and a sentence', async () => {
    const damaged = await staff.get('/api/jobs?scope=all&limit=5&cursor=WzEsMiwzXQ')
    expect(damaged.status).toBe(400)
    expect(damaged.body.message).toContain('page link is damaged')
    expect((await staff.get('/api/staff/members?limit=5000')).status).toBe(400)
  })

  it('page members, accounts, the outbox, payments (with totals) and a job’s history', async () => {
    for (const [client, path] of [[staff, '/api/staff/members'], [admin, '/api/admin/users'], [staff, '/api/staff/mail-outbox'], [member, '/api/me/payments']] as const) {
      const page = await client.get(`${path}?limit=1`)
      expect(page.status, path).toBe(200)
      expect(page.body, path).toMatchObject({ items: expect.any(Array), nextCursor: expect.toSatisfy((c: unknown) => c === null || typeof c === 'string') })
    }
    const payments = await admin.get('/api/admin/payments?limit=1')
    expect(payments.body).toMatchObject({ items: expect.any(Array), totals: expect.any(Array) })
    const events = await member.get(`/api/jobs/${jobIds[0]}/events?limit=1`)
    expect(events.status).toBe(200)
    expect(events.body.items).toMatchObject([{ to: 'draft', actorName: expect.any(String) }])
    expect((await staff.get(`/api/jobs/${jobIds[0]}/events`)).body.items).toHaveLength(1)
  })
})
