import type { InternalApi } from 'nitropack/types'

/**
 * The JSON a route answers, as Nitro types it from the route's handler (`defineApiHandler` keeps the type):
 * `ApiResponse<'/api/jobs/:id'>`, `ApiResponse<'/api/me/units', 'patch'>`. For props of components that show
 * what a page fetched; a page itself lets `useFetch('/api/…')` infer it. Never import server code for a type.
 */
export type ApiResponse<Route extends keyof InternalApi, Method extends keyof InternalApi[Route] = 'get' & keyof InternalApi[Route]> = InternalApi[Route][Method]

/** One row of a route that answers in pages (`usePagedList`): `ApiPageItem<'/api/staff/mail-outbox'>`. */
export type ApiPageItem<Route extends keyof InternalApi> = Extract<ApiResponse<Route>, { items: unknown[] }>['items'][number]

/** The job page's answer (`/api/jobs/:id`), which the job components show parts of. */
export type JobDetail = ApiResponse<'/api/jobs/:id'>
/** One warning group of a job, with its acknowledgement if there is one. */
export type WarningGroupView = JobDetail['warningGroups'][number]

/** A route that answers in pages when asked with `limit`, as its plain list without: `ApiFullList<'/api/jobs'>`. */
export type ApiFullList<Route extends keyof InternalApi> = Extract<ApiResponse<Route>, unknown[]>
