// The analysis queue through the built app: a small file of one member is answered while another member's
// heavy file runs, and GET /api/analysis/queue shows each member only their own analyses. Orders of
// events are asserted, never wall-clock bounds.
import { describe, expect, it } from 'vitest'
import { plainPart, svgDocument } from '../fixtures/svg'
import type { CatalogOverview } from './answers'
import { signedIn } from './helpers'

type Member = Awaited<ReturnType<typeof signedIn>>

/** An invented sheet of `side` × `side` small slotted parts: 2.9 MB at 160, over the heavy-upload size, seconds of analysis. */
function partSheet(side: number): string {
  const cells: string[] = []
  for (let row = 0; row < side; row++) {
    for (let column = 0; column < side; column++) {
      const x = column * 10
      const y = row * 10
      cells.push(`<rect x="${x + 1}" y="${y + 1}" width="8" height="8" rx="1"/><path d="M${x + 3} ${y + 5}H${x + 7}"/><circle cx="${x + 5}" cy="${y + 3}" r="0.8"/>`)
    }
  }
  return svgDocument(side * 10, side * 10, cells.join(''))
}

function fileForm(svg: string, name: string) {
  const form = new FormData()
  form.set('file', new Blob([svg], { type: 'image/svg+xml' }), name)
  return form
}

async function newJob(member: Member, title: string): Promise<number> {
  const overview = (await member.get<CatalogOverview>('/api/catalog/overview')).body
  const heron = overview.find((c) => c.name.startsWith('Heron'))!
  const created = await member.post('/api/jobs', { title, cutterId: heron.cutterId, materialId: heron.materials.find((m) => m.name === 'Birch plywood')!.materialId })
  expect(created.status).toBe(201)
  return created.body.id
}

interface QueueStatus {
  waiting: { label: string; ahead: number }[]
  running: { label: string; stage: string | null; runningMs: number }[]
}

async function queueOf(member: Member): Promise<QueueStatus> {
  const response = await member.get<QueueStatus>('/api/analysis/queue')
  expect(response.status).toBe(200)
  return response.body
}

/** Asks `probe` every 50 ms until it answers, for at most 30 s. */
async function until<T>(what: string, probe: () => Promise<T | undefined>): Promise<T> {
  const deadline = Date.now() + 30_000
  while (Date.now() < deadline) {
    const found = await probe()
    if (found !== undefined) return found
    await new Promise((resolve) => setTimeout(resolve, 50))
  }
  throw new Error(`Gave up waiting for ${what}`)
}

describe('the analysis queue', () => {
  it('answers a small file while another member\'s heavy file runs, and shows each member only their own analyses', async () => {
    const owner = await signedIn('member@example.test')
    const other = await signedIn('ines@example.test')
    const [ownerJob, otherJob] = await Promise.all([newJob(owner, 'Parts sheet'), newJob(other, 'Bracket')])
    const sheet = partSheet(160)
    const answered: string[] = []
    const upload = (member: Member, jobId: number, svg: string, name: string) =>
      member.form(`/api/jobs/${jobId}/files`, fileForm(svg, name)).then((response) => {
        answered.push(name)
        return response
      })

    const heavy = upload(owner, ownerJob, sheet, 'sheet-a.svg')
    const running = await until('the heavy file to report a stage', async () => (await queueOf(owner)).running.find((entry) => entry.label === 'sheet-a.svg' && entry.stage !== null))
    expect(['parse', 'read', 'flatten', 'chain', 'measure', 'checks', 'time', 'result', 'packing']).toContain(running.stage)

    // The member's second heavy file waits its turn: one heavy file runs at a time, first in line.
    const secondHeavy = upload(owner, ownerJob, sheet, 'sheet-b.svg')
    const ownerQueue = await until('the second heavy file to wait', async () => {
      const status = await queueOf(owner)
      return status.waiting.length > 0 ? status : undefined
    })
    expect(ownerQueue.waiting).toEqual([{ label: 'sheet-b.svg', ahead: 0 }])
    expect(ownerQueue.running.map((entry) => entry.label)).toEqual(['sheet-a.svg'])
    expect(await queueOf(other)).toEqual({ waiting: [], running: [] })

    const small = await upload(other, otherJob, plainPart(), 'bracket.svg')
    expect(small.status).toBe(201)
    const [first, second] = await Promise.all([heavy, secondHeavy])
    expect([first.status, second.status]).toEqual([201, 201])
    expect(answered).toEqual(['bracket.svg', 'sheet-a.svg', 'sheet-b.svg'])
    expect(await queueOf(owner)).toEqual({ waiting: [], running: [] })
  })
})
