import type { FormObject } from './form-body'
import type { RequestContext } from './store'

export interface ApiRequest {
  pathParams: Record<string, string>
  /** Form body of a POST, or query string of a GET, decoded from Stripe's bracket notation. */
  params: FormObject
  context: RequestContext
}

/** A handler returns the JSON body of a 200 answer or throws a StripeFakeError. */
export type ApiHandler = (request: ApiRequest) => unknown

export interface Route {
  method: 'GET' | 'POST'
  /** Path with `:name` segments, e.g. /v1/payment_intents/:intent/capture. */
  pattern: string
  handler: ApiHandler
}

export function matchRoute(routes: Route[], method: string, path: string): { route: Route; pathParams: Record<string, string> } | undefined {
  const segments = path.split('/')
  for (const route of routes) {
    if (route.method !== method) continue
    const patternSegments = route.pattern.split('/')
    if (patternSegments.length !== segments.length) continue
    const pathParams: Record<string, string> = {}
    const matches = patternSegments.every((patternSegment, index) => {
      if (patternSegment.startsWith(':')) {
        pathParams[patternSegment.slice(1)] = decodeURIComponent(segments[index]!)
        return segments[index] !== ''
      }
      return patternSegment === segments[index]
    })
    if (matches) return { route, pathParams }
  }
  return undefined
}
