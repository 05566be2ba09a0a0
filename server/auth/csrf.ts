// Synchroniser-token CSRF defence: the token lives in the session, the client echoes it in the
// X-CSRF-Token header on every state-changing request.
import { randomBytes, timingSafeEqual } from 'node:crypto'
import type { Request, RequestHandler } from 'express'
import { AppError } from '../http/errors'

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS'])

export function csrfTokenFor(req: Request): string {
  req.session.csrfToken ??= randomBytes(32).toString('base64url')
  return req.session.csrfToken
}

function same(a: string, b: string): boolean {
  const left = Buffer.from(a)
  const right = Buffer.from(b)
  return left.length === right.length && timingSafeEqual(left, right)
}

/** Refuses state-changing requests without the session's token; `exempt` paths carry their own proof (signed webhooks). */
export function csrfGuard(exempt: (path: string) => boolean): RequestHandler {
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method) || exempt(req.path)) return next()
    const sent = req.get('x-csrf-token')
    const expected = req.session?.csrfToken
    if (!sent || !expected || !same(sent, expected)) {
      throw new AppError(403, 'csrf_failed', 'Missing or wrong X-CSRF-Token header; fetch GET /api/auth/csrf and retry', {
        'x-csrf-token': sent ? 'does not match this session' : 'required',
      })
    }
    next()
  }
}
