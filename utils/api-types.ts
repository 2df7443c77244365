import type { InternalApi } from 'nitropack/types'

/**
 * The JSON a route answers, as Nitro types it from the route's handler (`defineApiHandler` keeps the type):
 * `ApiResponse<'/api/jobs/:id'>`, `ApiResponse<'/api/me/units', 'patch'>`. For props of components that show
 * what a page fetched; a page itself lets `useFetch('/api/…')` infer it. Never import server code for a type.
 */
export type ApiResponse<Route extends keyof InternalApi, Method extends keyof InternalApi[Route] = 'get' & keyof InternalApi[Route]> = InternalApi[Route][Method]
