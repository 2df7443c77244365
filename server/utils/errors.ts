// Typed errors thrown by services; toHttpError (in handler.ts) is the one place that maps them to HTTP.
export class DomainError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly details?: Record<string, unknown>,
  ) {
    super(message)
    this.name = new.target.name
  }
}

export class InvalidInput extends DomainError {
  constructor(message: string, details?: Record<string, unknown>) {
    super(message, 400, details)
  }
}
export class Unauthorized extends DomainError {
  constructor(message = 'Please sign in.') {
    super(message, 401)
  }
}
export class Forbidden extends DomainError {
  constructor(message = 'Your role does not allow this.') {
    super(message, 403)
  }
}
export class NotFound extends DomainError {
  constructor(message = 'Not found.') {
    super(message, 404)
  }
}
export class Conflict extends DomainError {
  constructor(message: string, details?: Record<string, unknown>) {
    super(message, 409, details)
  }
}
export class TooManyRequests extends DomainError {
  constructor(
    message: string,
    readonly retryAfterS: number,
  ) {
    super(message, 429)
  }
}
export class PayloadTooLarge extends DomainError {
  constructor(message: string) {
    super(message, 413)
  }
}
export class UnsupportedMediaType extends DomainError {
  constructor(message: string) {
    super(message, 415)
  }
}
