import type { ErrorRequestHandler, RequestHandler } from 'express'
import { MulterError } from 'multer'
import { AppError } from './errors'

interface BodyParserError {
  type?: string
  status?: number
  limit?: number
}

function bodyParserError(error: unknown): BodyParserError | undefined {
  if (typeof error !== 'object' || error === null || !('type' in error)) return undefined
  return error as BodyParserError
}

const CONNECTION_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'PROTOCOL_CONNECTION_LOST', 'ER_CON_COUNT_ERROR', 'ER_SERVER_SHUTDOWN'])

/** True for failures that mean MariaDB is not reachable (an operational fault, not a bug). */
export function isDatabaseDown(error: unknown): boolean {
  for (let current: unknown = error, depth = 0; current && typeof current === 'object' && depth < 4; depth += 1) {
    const code = 'code' in current ? current.code : undefined
    if (typeof code === 'string' && CONNECTION_CODES.has(code)) return true
    current = 'driverError' in current ? current.driverError : 'cause' in current ? current.cause : undefined
  }
  return false
}

export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json({ error: { code: 'not_found', message: `No API route ${req.method} ${req.path}` } })
}

/** The one place where failures become HTTP answers; unexpected errors are logged and hidden. */
export function errorHandler(log: (error: unknown) => void = console.error): ErrorRequestHandler {
  return (error: unknown, _req, res, next) => {
    if (res.headersSent) {
      next(error)
      return
    }
    if (error instanceof AppError) {
      res.status(error.status).json({ error: { code: error.code, message: error.message, fields: error.fields } })
      return
    }
    if (error instanceof MulterError) {
      const tooLarge = error.code === 'LIMIT_FILE_SIZE'
      res.status(tooLarge ? 413 : 400).json({
        error: {
          code: tooLarge ? 'file_too_large' : 'upload_rejected',
          message: tooLarge ? 'The file is larger than the upload limit' : error.message,
          fields: { [error.field ?? 'file']: error.message },
        },
      })
      return
    }
    const parser = bodyParserError(error)
    if (parser?.type === 'entity.parse.failed') {
      res.status(400).json({ error: { code: 'bad_json', message: 'The request body is not valid JSON', fields: { body: 'not valid JSON' } } })
      return
    }
    if (parser?.type === 'entity.too.large') {
      res.status(413).json({ error: { code: 'body_too_large', message: 'The request body is too large', fields: { body: `larger than ${parser.limit ?? 'the limit'} bytes` } } })
      return
    }
    if (parser?.type && parser.status && parser.status < 500) {
      res.status(parser.status).json({ error: { code: 'bad_request', message: 'The request body could not be read', fields: { body: parser.type } } })
      return
    }
    // http-errors from Express internals (send, static) that are the client's doing.
    if (typeof error === 'object' && error !== null && 'status' in error && typeof error.status === 'number' && error.status >= 400 && error.status < 500 && 'expose' in error && error.expose === true) {
      res.status(error.status).json({ error: { code: error.status === 404 ? 'not_found' : 'bad_request', message: error instanceof Error ? error.message : 'Bad request' } })
      return
    }
    if (isDatabaseDown(error)) {
      res.status(503).json({ error: { code: 'database_unavailable', message: 'The database is not answering; nothing was saved. Try again in a moment' } })
      return
    }
    log(error)
    res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on our side; it has been logged' } })
  }
}
