// Who may call which route: one entry per route file under server/api and server/routes, keyed
// "METHOD /path/:param" as the file name spells it. tests/api/authorization-matrix.test.ts calls
// every route as each caller and fails on any route file without an entry here.
import { randomBytes } from 'node:crypto'
import { plainPart } from '../fixtures/svg'
import { client, signedIn, sqlRow } from './helpers'
import { bookingBench, type BookingBench, type Client } from './workshop-setup'

/** The callers of the matrix: `member` owns the objects built for it, `otherMember` does not. */
export const CALLERS = ['anonymous', 'member', 'otherMember', 'staff', 'admin'] as const
export type Caller = (typeof CALLERS)[number]

export const CALLER_EMAILS: Record<Exclude<Caller, 'anonymous'>, string> = {
  member: 'member@example.test',
  otherMember: 'ines@example.test',
  staff: 'staff@example.test',
  admin: 'admin@example.test',
}

/**
 * What a caller must see. 'ok': a 2xx answer. 'passes': the guard let the caller through — any answer
 * but 401, 403 or 404 and no server error (the minimal body may then fail validation, or the object
 * be in the wrong state). A number: exactly that status, which is the guard's answer.
 */
export type Expected = 'ok' | 'passes' | 401 | 403 | 404
export type Policy = Record<Caller, Expected>

type Params = Record<string, string | number>

export interface RouteAccess {
  policy: Policy
  /** Values of the route's :params for one call; routes that use up their object get a fresh one each call. */
  params?: (world: World, caller: Caller) => Params | Promise<Params>
  query?: (world: World) => string
  /** JSON body; `{}` unless given, enough for the guard to answer. */
  body?: (world: World) => unknown
  /** The call ends the caller's session, so it is made from a session of its own. */
  endsSession?: boolean
  /** The call ends every session of the caller's account, so the matrix makes it after all other routes. */
  endsEverySession?: boolean
  /** The path holds the member's secret link, so anyone calling it rightly sees the member's things. */
  pathIsCredential?: boolean
}

async function newestMailId(): Promise<number> {
  return (await sqlRow<{ id: number | null }>('select max(id) as id from mail_outbox'))?.id ?? 1
}

const everyone = (expected: Expected): Policy => ({ anonymous: expected, member: expected, otherMember: expected, staff: expected, admin: expected })
const PUBLIC = everyone('passes')
const signedInOnly = (expected: Expected = 'ok'): Policy => ({ anonymous: 401, member: expected, otherMember: expected, staff: expected, admin: expected })
const staffOnly = (expected: Expected = 'passes'): Policy => ({ anonymous: 401, member: 403, otherMember: 403, staff: expected, admin: expected })
const adminOnly = (expected: Expected = 'passes'): Policy => ({ anonymous: 401, member: 403, otherMember: 403, staff: 403, admin: expected })
/** The member's own object: staff may see and handle it, another member must not learn it exists. */
const ownerAndStaff = (expected: Expected = 'passes'): Policy => ({ anonymous: 401, member: expected, otherMember: 404, staff: expected, admin: expected })
/** Moves only the member may make on their own job (the state machine's `owner`). */
const OWNER_MOVE: Policy = { anonymous: 401, member: 'passes', otherMember: 404, staff: 403, admin: 403 }
/** Review moves on the member's job: staff only; the member is refused, another member not told it exists. */
const STAFF_MOVE: Policy = { anonymous: 401, member: 403, otherMember: 404, staff: 'passes', admin: 'passes' }

/** Objects made through the API before the matrix runs, and makers of fresh ones. */
export interface World {
  bench: BookingBench
  jobId: number
  fileId: number
  approvedJobId: number
  bookingId: number
  processSettingId: number
  colourId: number
  closureId: number
  signOffId: number
  otherMemberId: number
  /** Text only the member's own answers (and staff's) may contain. */
  privateMarkers: string[]
  freshJob: () => Promise<number>
  freshFile: () => Promise<Params>
  freshBooking: () => Promise<number>
  freshCutter: () => Promise<number>
  freshClosure: () => Promise<number>
  freshColour: () => Promise<number>
  freshMaterial: () => Promise<number>
  freshProcessSetting: () => Promise<number>
}

function created(response: { status: number; body: any }, what: string): number {
  if (response.status !== 201 && response.status !== 200) throw new Error(`could not create ${what}: ${response.status} ${JSON.stringify(response.body)}`)
  return response.body.id ?? response.body.fileId
}

function cutterBody(name: string) {
  return {
    name, kind: 'co2-laser', bedWidthMm: 600, bedHeightMm: 400, maxThicknessMm: 6, pricePerMinuteMinor: 90, currency: 'EUR',
    setupMinutes: 5, billingIncrementMinutes: 1, bookingGranularityMinutes: 15, maxSpeedMmPerMin: 20000, accelMmPerS2: 2000,
    rapidMmPerMin: 30000, junctionDeviationMm: 0.05, pierceOverheadS: 0.2,
  }
}

let slotCounter = 0

export async function buildWorld(): Promise<World> {
  const bench = await bookingBench()
  const { admin, staff, member, cutterId, materialId } = bench
  const tag = randomBytes(4).toString('hex')
  const title = `Matrix private job ${tag}`
  const fileName = `matrix-private-${tag}`

  async function upload(jobId: number, name: string): Promise<number> {
    const form = new FormData()
    form.set('file', new Blob([plainPart()], { type: 'image/svg+xml' }), `${name}.svg`)
    return created(await member.form(`/api/jobs/${jobId}/files`, form), 'a job file')
  }
  const freshJob = async () => {
    const jobId = created(await member.post('/api/jobs', { title, cutterId, materialId }), 'a job')
    await upload(jobId, fileName)
    return jobId
  }
  const jobId = await freshJob()
  const fileId = (await member.get(`/api/jobs/${jobId}`)).body.files[0].id as number
  const approvedJobId = await bench.approvedJob(title)
  // Each booking its own quarter hour, well away from the slots other test files use.
  const freshBooking = async () => {
    const slot = slotCounter++
    const start = bench.at(20 + Math.floor(slot / 40), `${8 + Math.floor((slot % 40) / 4)}:${String((slot % 4) * 15).padStart(2, '0')}`)
    return created(await member.post('/api/bookings', { jobId: await bench.approvedJob(title), cutterId, start }), 'a booking')
  }
  const freshCutter = async () => created(await admin.post('/api/catalog/cutters', cutterBody(`Matrix cutter ${tag} ${++slotCounter}`)), 'a cutter')
  const freshClosure = async () =>
    created(await staff.post('/api/catalog/closures', { cutterId, startsAt: bench.at(200, '09:00'), endsAt: bench.at(200, '10:00'), reason: 'Matrix closure' }), 'a closure')
  const freshColour = async () => created(await staff.post('/api/catalog/colours', { label: `Matrix ${++slotCounter}`, hex: `#${randomBytes(3).toString('hex')}`, operation: 'ignore', tolerance: 0 }), 'a colour')
  const freshMaterial = async () =>
    created(await staff.post('/api/catalog/materials', { name: `Matrix cork ${tag} ${++slotCounter}`, family: 'other', thicknessMm: 3, sheets: [{ widthMm: 600, heightMm: 400, priceMinor: 0, currency: 'EUR' }], rules: [] }), 'a material')
  const freshProcessSetting = async () =>
    created(
      await staff.post('/api/catalog/process-settings', {
        cutterId: await freshCutter(), materialId, cutSpeedMmPerMin: 1200, kerfMm: 0.2, pierceS: 0.1, minBridgeMm: 3, minHoleMm: 1,
        scoreSpeedMmPerMin: 6000, engraveSpeedMmPerMin: 18000, engraveLineIntervalMm: 0.1,
      }),
      'a process setting',
    )

  const members = (await staff.get('/api/staff/members')).body as { id: number; email: string }[]
  const otherMemberId = members.find((m) => m.email === CALLER_EMAILS.otherMember)!.id
  const signOffId = created(await staff.post('/api/sign-offs', { userId: otherMemberId, cutterId, signedOffOn: '2026-01-05' }), 'a sign-off')

  return {
    bench,
    jobId,
    fileId,
    approvedJobId,
    bookingId: await freshBooking(),
    processSettingId: await freshProcessSetting(),
    colourId: await freshColour(),
    closureId: await freshClosure(),
    signOffId,
    otherMemberId,
    privateMarkers: [title, fileName],
    freshJob,
    freshFile: async () => {
      const fresh = await freshJob()
      return { id: fresh, fileId: (await member.get(`/api/jobs/${fresh}`)).body.files[0].id }
    },
    freshBooking,
    freshCutter,
    freshClosure,
    freshColour,
    freshMaterial,
    freshProcessSetting,
  }
}

/** A signed-in client per caller, or an anonymous one. */
export async function callerClient(caller: Caller): Promise<Client> {
  return caller === 'anonymous' ? client() : signedIn(CALLER_EMAILS[caller])
}

const range = (w: World) =>
  `cutter=${w.bench.cutterId}&from=${encodeURIComponent(w.bench.at(19, '00:00'))}&to=${encodeURIComponent(w.bench.at(25, '00:00'))}`
const job = (w: World) => ({ id: w.jobId })
const freshDxfLayer = async () => {
  const staff = await signedIn(CALLER_EMAILS.staff)
  return { id: created(await staff.post('/api/catalog/dxf-layers', { layer: `matrix-${randomBytes(4).toString('hex')}`, operation: 'ignore' }), 'a DXF layer mapping') }
}
/** An out-of-service period on a cutter of its own, so it calls off nobody's booking. */
const freshOutage = async (w: World) => {
  const staff = await signedIn(CALLER_EMAILS.staff)
  const outage = await staff.post('/api/outages', { cutterId: await w.freshCutter(), reason: 'Matrix outage', start: w.bench.at(300, '09:00'), expectedBackAt: w.bench.at(300, '12:00') })
  if (outage.status !== 201) throw new Error(`could not create an outage: ${outage.status} ${JSON.stringify(outage.body)}`)
  return { id: outage.body.outage.id as number }
}
const jobFile = (w: World) => ({ id: w.jobId, fileId: w.fileId })
const freshJob = async (w: World) => ({ id: await w.freshJob() })
const booking = (w: World) => ({ id: w.bookingId })
const cutter = (w: World) => ({ id: w.bench.cutterId })
const material = (w: World) => ({ id: w.bench.materialId })

export const ROUTE_ACCESS: Record<string, RouteAccess> = {
  'PATCH /api/admin/settings': { policy: adminOnly() },
  'POST /api/admin/tasks/send-reminders': { policy: adminOnly('ok') },
  'PATCH /api/admin/users/:id': { policy: adminOnly(), params: (w) => ({ id: w.otherMemberId }) },
  'GET /api/admin/users': { policy: adminOnly('ok') },
  'POST /api/analysis': { policy: signedInOnly('passes') },
  'GET /api/analysis/queue': { policy: signedInOnly() },

  'POST /api/auth/forgot-password': { policy: PUBLIC },
  'POST /api/auth/verification-mail': { policy: PUBLIC },
  'POST /api/auth/reset-password': { policy: PUBLIC },
  'POST /api/auth/sign-in': { policy: PUBLIC },
  'POST /api/auth/sign-out': { policy: everyone('ok'), endsSession: true },
  'POST /api/auth/sign-up': { policy: PUBLIC },
  'POST /api/auth/verify': { policy: PUBLIC },

  'GET /api/bookings': { policy: signedInOnly(), query: range },
  'POST /api/bookings': { policy: signedInOnly('passes') },
  'PATCH /api/bookings/:id': { policy: ownerAndStaff(), params: booking },
  'GET /api/bookings/:id/calendar': { policy: ownerAndStaff('ok'), params: booking },
  'POST /api/bookings/:id/cancel': { policy: ownerAndStaff(), params: async (w) => ({ id: await w.freshBooking() }) },
  'GET /api/bookings/:id/cancellation-terms': { policy: ownerAndStaff('ok'), params: booking },
  'POST /api/bookings/blocks': { policy: staffOnly() },
  'GET /api/bookings/suggestions': { policy: ownerAndStaff('ok'), query: (w) => `jobId=${w.approvedJobId}` },

  'GET /api/catalog/closures': { policy: signedInOnly() },
  'POST /api/catalog/closures': { policy: staffOnly() },
  'DELETE /api/catalog/closures/:id': { policy: staffOnly(), params: async (w) => ({ id: await w.freshClosure() }) },
  'GET /api/catalog/colours': { policy: signedInOnly() },
  'POST /api/catalog/colours': { policy: staffOnly() },
  'PATCH /api/catalog/colours/:id': { policy: staffOnly(), params: (w) => ({ id: w.colourId }) },
  'DELETE /api/catalog/colours/:id': { policy: staffOnly(), params: async (w) => ({ id: await w.freshColour() }) },
  'GET /api/catalog/cutters': { policy: signedInOnly() },
  // Adding or removing a cutter sets prices, which is an admin's decision.
  'POST /api/catalog/cutters': { policy: adminOnly(), body: () => cutterBody(`Matrix cutter ${randomBytes(4).toString('hex')}`) },
  'GET /api/catalog/cutters/:id': { policy: signedInOnly(), params: cutter },
  'PATCH /api/catalog/cutters/:id': { policy: staffOnly(), params: cutter },
  'DELETE /api/catalog/cutters/:id': { policy: adminOnly(), params: async (w) => ({ id: await w.freshCutter() }) },
  'GET /api/catalog/cutters/:id/availability': { policy: signedInOnly(), params: cutter, query: (w) => range(w).replace(/^cutter=\d+&/, '') },
  'GET /api/catalog/cutters/:id/hours': { policy: signedInOnly(), params: cutter },
  'PUT /api/catalog/cutters/:id/hours': { policy: staffOnly(), params: cutter },
  'GET /api/catalog/materials': { policy: signedInOnly() },
  'POST /api/catalog/materials': { policy: staffOnly() },
  'GET /api/catalog/materials/:id': { policy: signedInOnly(), params: material },
  'PATCH /api/catalog/materials/:id': { policy: staffOnly(), params: material },
  'DELETE /api/catalog/materials/:id': { policy: staffOnly(), params: async (w) => ({ id: await w.freshMaterial() }) },
  'GET /api/catalog/overview': { policy: signedInOnly() },
  'GET /api/catalog/process-settings': { policy: signedInOnly() },
  'POST /api/catalog/process-settings': { policy: staffOnly() },
  'PATCH /api/catalog/process-settings/:id': { policy: staffOnly(), params: (w) => ({ id: w.processSettingId }) },
  'DELETE /api/catalog/process-settings/:id': { policy: staffOnly(), params: async (w) => ({ id: await w.freshProcessSetting() }) },

  // Development only: the app under test is a production build, where the route answers 404 to everyone.
  'GET /api/dev/outbox': { policy: everyone(404) },

  'GET /api/jobs': { policy: signedInOnly() },
  'POST /api/jobs': { policy: signedInOnly('passes') },
  'GET /api/jobs/:id': { policy: ownerAndStaff('ok'), params: job },
  'GET /api/jobs/:id/events': { policy: ownerAndStaff('ok'), params: job },
  'PATCH /api/jobs/:id': { policy: ownerAndStaff(), params: job },
  'POST /api/jobs/:id/approve': { policy: STAFF_MOVE, params: freshJob },
  'POST /api/jobs/:id/files': { policy: ownerAndStaff(), params: job },
  'PATCH /api/jobs/:id/files/:fileId': { policy: ownerAndStaff(), params: jobFile },
  'DELETE /api/jobs/:id/files/:fileId': { policy: ownerAndStaff(), params: (w) => w.freshFile() },
  'GET /api/jobs/:id/files/:fileId/revisions/:revision': { policy: ownerAndStaff('ok'), params: (w) => ({ ...jobFile(w), revision: 1 }) },
  'GET /api/jobs/:id/files/:fileId/revisions/:revision/:part': { policy: ownerAndStaff('ok'), params: (w) => ({ ...jobFile(w), revision: 1, part: 'geometry' }) },
  'POST /api/jobs/:id/files/:fileId/revisions': { policy: ownerAndStaff(), params: jobFile },
  'POST /api/jobs/:id/override': { policy: { ...staffOnly(), otherMember: 403 }, params: freshJob },
  'POST /api/jobs/:id/reject': { policy: STAFF_MOVE, params: freshJob },
  'POST /api/jobs/:id/request-changes': { policy: STAFF_MOVE, params: freshJob },
  'POST /api/jobs/:id/submit': { policy: OWNER_MOVE, params: freshJob },
  'POST /api/jobs/:id/withdraw': { policy: OWNER_MOVE, params: freshJob },

  'GET /api/me': { policy: signedInOnly() },
  'GET /api/me/calendar-feed': { policy: signedInOnly() },
  'POST /api/me/calendar-feed': { policy: signedInOnly() },
  'DELETE /api/me/calendar-feed': { policy: signedInOnly() },
  'POST /api/me/password': { policy: signedInOnly('passes') },
  'POST /api/me/sign-out-everywhere': { policy: signedInOnly('ok'), endsSession: true, endsEverySession: true },
  'GET /api/me/sign-offs': { policy: signedInOnly() },
  'GET /api/settings': { policy: signedInOnly() },

  'GET /api/sign-offs': { policy: staffOnly('ok') },
  'POST /api/sign-offs': { policy: staffOnly() },
  'POST /api/sign-offs/:id/revoke': { policy: staffOnly(), params: (w) => ({ id: w.signOffId }) },
  'GET /api/staff/members': { policy: staffOnly('ok') },

  'GET /calendar-feed/:token': {
    policy: everyone('ok'),
    pathIsCredential: true,
    params: async (w) => ({ token: new URL((await w.bench.member.post('/api/me/calendar-feed')).body.url).pathname.split('/').pop()! }),
  },
  'GET /api/catalog/dxf-layers': { policy: signedInOnly('ok') },
  'POST /api/catalog/dxf-layers': { policy: staffOnly() },
  'PATCH /api/catalog/dxf-layers/:id': { policy: staffOnly(), params: freshDxfLayer },
  'DELETE /api/catalog/dxf-layers/:id': { policy: staffOnly(), params: freshDxfLayer },
  // Money, the cutting day and pickups.
  'GET /api/admin/payments': { policy: adminOnly('ok') },
  'GET /api/me/payments': { policy: signedInOnly('ok') },
  'GET /api/me/balances': { policy: signedInOnly('ok') },
  'POST /api/payments/:bookingId/refund': { policy: staffOnly(), params: (w) => ({ bookingId: w.bookingId }) },
  // The member's own balance (409 while nothing is owed); another member is not told the booking exists.
  'GET /api/staff/mail-outbox': { policy: staffOnly('ok') },
  // The newest mail in the outbox (delivered: a 409 once through the guard).
  'POST /api/staff/mail-outbox/:id/retry': { policy: staffOnly(), params: async () => ({ id: await newestMailId() }) },
  'POST /api/payments/:bookingId/balance': { policy: ownerAndStaff(), params: (w) => ({ bookingId: w.bookingId }) },
  // Anyone may knock; only a valid Stripe-Signature gets in (an unsigned call is a 400).
  'POST /api/webhooks/stripe': { policy: PUBLIC },
  'POST /api/admin/tasks/release-holds': { policy: adminOnly('ok') },
  'POST /api/admin/tasks/reconcile-payments': { policy: adminOnly('ok') },
  'POST /api/admin/tasks/pickup-reminders': { policy: adminOnly('ok') },
  'POST /api/jobs/:id/start': { policy: staffOnly(), params: job },
  'POST /api/jobs/:id/timer': { policy: staffOnly(), params: job },
  'POST /api/jobs/:id/finish': { policy: staffOnly(), params: job },
  'GET /api/jobs/:id/finish-quote': { policy: staffOnly(), params: job },
  'POST /api/jobs/:id/problems': { policy: staffOnly(), params: job },
  'POST /api/jobs/:id/ready': { policy: staffOnly(), params: job },
  'GET /api/jobs/:id/sheets/:sheet': { policy: staffOnly('ok'), params: (w) => ({ ...job(w), sheet: 1 }) },
  // The code exists only while the parts wait, and only the owner ever reads it; staff ask the member.
  'GET /api/jobs/:id/pickup': { policy: { anonymous: 401, member: 404, otherMember: 404, staff: 404, admin: 404 }, params: job },
  'POST /api/pickups/collect': { policy: staffOnly() },
  'GET /api/me/units': { policy: signedInOnly() },
  'PATCH /api/me/units': { policy: signedInOnly('passes') },
  'GET /api/home/member': { policy: signedInOnly() },
  'GET /api/home/staff': { policy: staffOnly('ok') },
  'GET /api/home/admin': { policy: adminOnly('ok') },
  'GET /api/outages': { policy: staffOnly('ok') },
  'POST /api/outages': { policy: staffOnly() },
  'PATCH /api/outages/:id': { policy: staffOnly('ok'), params: freshOutage },
  'POST /api/outages/:id/end': { policy: staffOnly('ok'), params: freshOutage },
  'GET /api/run-sheet': { policy: staffOnly('ok'), query: (w) => `cutter=${w.bench.cutterId}&date=2027-01-04` },
  // Reports.
  'GET /api/reports/utilisation': { policy: staffOnly('ok') },
  'GET /api/reports/revenue': { policy: staffOnly('ok') },
  'GET /api/reports/minutes-by-member': { policy: staffOnly('ok') },
  'GET /api/reports/materials': { policy: staffOnly('ok') },
  'GET /api/reports/jobs-by-state': { policy: staffOnly('ok') },
  'GET /api/reports/turnaround': { policy: staffOnly('ok') },
  'GET /api/reports/estimate-accuracy': { policy: staffOnly('ok') },
  'GET /api/reports/estimate-points': { policy: staffOnly('ok') },
}
