import { createError, defineEventHandler, getQuery, getRouterParams, readBody, setResponseHeader, type EventHandler, type EventHandlerRequest, type H3Event } from 'h3'
import Stripe from 'stripe'
import { ZodError, type ZodType } from 'zod'
import { fieldMessages, summariseFields } from '#shared/schemas/field-messages'
import { bodyLimitError } from './body-limit'
import { DomainError, InvalidInput, TooManyRequests } from './errors'

/** Turns a zod failure into one readable sentence plus per-field messages for forms. */
export function zodToInvalidInput(error: ZodError): InvalidInput {
  const fields = fieldMessages(error)
  return new InvalidInput(summariseFields(fields), { fields })
}

function toHttpError(event: H3Event, error: unknown): unknown {
  if (error instanceof ZodError) error = zodToInvalidInput(error)
  if (error instanceof Stripe.errors.StripeError) {
    console.error('[stripe]', error.type, error.message)
    error = new DomainError(`The payment service refused or did not answer (${error.message}). Nothing was changed; please try again.`, 502)
  }
  if (error instanceof TooManyRequests) setResponseHeader(event, 'Retry-After', error.retryAfterS)
  if (error instanceof DomainError) {
    return createError({ statusCode: error.status, statusMessage: error.name, message: error.message, data: error.details })
  }
  return error
}

/**
 * defineEventHandler plus the mapping of typed service errors to HTTP status and message. The handler's return type
 * is kept, so Nitro types the route and `useFetch('/api/…')` / `$fetch` know the response's shape.
 */
export function defineApiHandler<T>(handler: (event: H3Event<EventHandlerRequest>) => T | Promise<T>): EventHandler<EventHandlerRequest, Promise<T>> {
  return defineEventHandler(async (event): Promise<T> => {
    try {
      return await handler(event)
    } catch (error) {
      throw toHttpError(event, error)
    }
  })
}

/** Reads a JSON body and validates it; malformed JSON and schema failures both become 400. */
export async function readBodyAs<S extends ZodType>(event: H3Event, schema: S): Promise<import('zod').output<S>> {
  let body: unknown
  try {
    body = await readBody(event, { strict: true })
  } catch {
    throw bodyLimitError(event) ?? new InvalidInput('The request body is not valid JSON.')
  }
  return schema.parse(body ?? {})
}

export function readQueryAs<S extends ZodType>(event: H3Event, schema: S): import('zod').output<S> {
  return schema.parse(getQuery(event))
}

export function readParamsAs<S extends ZodType>(event: H3Event, schema: S): import('zod').output<S> {
  return schema.parse(getRouterParams(event))
}
