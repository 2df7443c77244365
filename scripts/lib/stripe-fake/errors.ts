// Stripe's error body and the HTTP statuses it documents for each kind of error
// (API reference, "Errors" and "HTTP status code summary").
export type StripeErrorType = 'invalid_request_error' | 'card_error' | 'idempotency_error' | 'api_error'

export interface StripeErrorBody {
  type: StripeErrorType
  message: string
  code?: string
  decline_code?: string
  param?: string
  payment_intent?: unknown
}

export class StripeFakeError extends Error {
  constructor(
    readonly statusCode: number,
    readonly body: StripeErrorBody,
    /** Stripe saves no idempotent result for requests that fail parameter validation (idempotency docs). */
    readonly failedValidation = false,
  ) {
    super(body.message)
  }
}

export function invalidRequest(message: string, details: { code?: string; param?: string } = {}): StripeFakeError {
  return new StripeFakeError(400, { type: 'invalid_request_error', message, ...details })
}

export function invalidParam(message: string, param: string, code?: string): StripeFakeError {
  return new StripeFakeError(400, { type: 'invalid_request_error', message, param, ...(code ? { code } : {}) }, true)
}

/** 404 with code resource_missing; `param` names the path parameter, as in Stripe's "No such …" errors. */
export function resourceMissing(objectName: string, id: string, param: string): StripeFakeError {
  return new StripeFakeError(404, {
    type: 'invalid_request_error',
    code: 'resource_missing',
    message: `No such ${objectName}: '${id}'`,
    param,
  })
}

/** Unrecognised route: Stripe answers 404 invalid_request_error without a code. */
export function unknownRoute(method: string, path: string): StripeFakeError {
  return new StripeFakeError(404, {
    type: 'invalid_request_error',
    message: `Unrecognized request URL (${method}: ${path}). This fake implements only the endpoints listed in its README.`,
  })
}

/** Stripe answers a bad key with 401 and type invalid_request_error (from memory of live responses). */
export function invalidApiKey(message: string): StripeFakeError {
  return new StripeFakeError(401, { type: 'invalid_request_error', message })
}

export function idempotencyMismatch(key: string): StripeFakeError {
  return new StripeFakeError(400, {
    type: 'idempotency_error',
    message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
  })
}

export function unexpectedState(objectName: string, message: string): StripeFakeError {
  return invalidRequest(message, { code: `${objectName}_unexpected_state` })
}
