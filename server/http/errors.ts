// Typed operational errors. Services throw these; only the error handler turns them into HTTP.
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message)
  }
}

export class ValidationError extends AppError {
  constructor(fields: Record<string, string>, message = 'Some fields need attention') {
    super(400, 'validation_failed', message, fields)
  }
}

export class UnauthorizedError extends AppError {
  constructor(message = 'Sign in to continue') {
    super(401, 'unauthorized', message)
  }
}

export class ForbiddenError extends AppError {
  constructor(message = 'Your role does not allow this') {
    super(403, 'forbidden', message)
  }
}

export class NotFoundError extends AppError {
  constructor(what = 'Resource') {
    super(404, 'not_found', `${what} not found`)
  }
}

export class ConflictError extends AppError {
  constructor(message: string, code = 'conflict') {
    super(409, code, message)
  }
}

export class ServiceUnavailableError extends AppError {
  constructor(message: string, code = 'service_unavailable') {
    super(503, code, message)
  }
}
