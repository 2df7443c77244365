import { z } from 'zod'
import { paginate } from '../lists'
import { expandOnlyParams, paginationParams, parseParams } from '../params'
import type { Route } from '../router'
import { findOrThrow, type StripeFakeState } from '../store'

const listEventParams = z.strictObject({ ...paginationParams, type: z.string().optional(), types: z.array(z.string()).max(20).optional() })

/** API reference, "List all events": `type` may use `*` as a wildcard, e.g. payment_intent.*. */
function typeMatcher(pattern: string): RegExp {
  return new RegExp(`^${pattern.split('*').map((part) => part.replace(/[.+?^${}()|[\]\\]/g, '\\$&')).join('.*')}$`)
}

export function eventRoutes(state: StripeFakeState): Route[] {
  return [
    {
      method: 'GET',
      pattern: '/v1/events',
      handler: ({ params }) => {
        const { limit, starting_after: startingAfter, type, types } = parseParams(listEventParams, params)
        const matchers = [type, ...(types ?? [])].filter((pattern) => pattern !== undefined).map(typeMatcher)
        const wanted = (type: string) => matchers.length === 0 || matchers.some((matcher) => matcher.test(type))
        const newestFirst = [...state.events.values()].reverse().filter((event) => wanted(event.type))
        return paginate(newestFirst, '/v1/events', limit, startingAfter)
      },
    },
    {
      method: 'GET',
      pattern: '/v1/events/:id',
      handler: ({ params, pathParams }) => {
        parseParams(expandOnlyParams, params)
        return findOrThrow(state.events, pathParams.id!, 'event', 'id')
      },
    },
  ]
}
