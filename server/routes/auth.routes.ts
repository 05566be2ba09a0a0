import type { Request, Response, NextFunction } from 'express'
import type passport from 'passport'
import { rateLimit, ipKeyGenerator } from 'express-rate-limit'
import { preferencesBodySchema, signInBodySchema, type SessionUser } from '../../shared/contracts/auth.contract'
import { csrfTokenFor } from '../auth/csrf'
import { ApiRouter } from '../http/api-router'
import { AppError, UnauthorizedError } from '../http/errors'
import { parseOrThrow } from '../http/validate'
import type { UserService } from '../services/user.service'

export interface AuthRouteDeps {
  passport: passport.PassportStatic
  users: UserService
  limits: { perIp: number; perAccount: number; windowMinutes: number }
}

function tooMany(_req: Request, res: Response): void {
  res.status(429).json({ error: { code: 'rate_limited', message: 'Too many sign-in attempts; wait a few minutes and try again' } })
}

function signedInUser(req: Request): SessionUser {
  if (!req.user) throw new UnauthorizedError()
  return req.user
}

export function authRoutes({ passport, users, limits }: AuthRouteDeps): ApiRouter {
  const api = new ApiRouter('/auth')
  const windowMs = limits.windowMinutes * 60 * 1000
  const perIp = rateLimit({ windowMs, limit: limits.perIp, standardHeaders: 'draft-8', legacyHeaders: false, handler: tooMany })
  const perAccount = rateLimit({
    windowMs,
    limit: limits.perAccount,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    keyGenerator: (req) => {
      const email: unknown = req.body?.email
      return typeof email === 'string' ? `account:${email.trim().toLowerCase()}` : `ip:${ipKeyGenerator(req.ip ?? '')}`
    },
    handler: tooMany,
  })

  api.get('/csrf', 'public', (req, res) => {
    res.json({ token: csrfTokenFor(req) })
  })

  api.post('/sign-in', 'public', perIp, perAccount, (req: Request, res: Response, next: NextFunction) => {
    req.body = parseOrThrow(signInBodySchema, req.body ?? {})
    passport.authenticate('local', (error: unknown, user: SessionUser | false) => {
      if (error) return next(error)
      if (!user) return next(new AppError(401, 'bad_credentials', 'E-mail or password is not right'))
      // passport 0.7 regenerates the session id here (no fixation); the new session gets a fresh CSRF token.
      req.logIn(user, (loginError) => {
        if (loginError) return next(loginError)
        csrfTokenFor(req)
        res.json(user)
      })
    })(req, res, next)
  })

  api.post('/sign-out', 'public', (req, res, next) => {
    req.logout((error) => {
      if (error) return next(error)
      req.session.destroy((destroyError) => {
        if (destroyError) return next(destroyError)
        res.clearCookie('spinwright.sid')
        res.status(204).end()
      })
    })
  })

  api.get('/me', 'signed-in', (req, res) => {
    res.json(signedInUser(req))
  })

  api.patch('/me/preferences', 'signed-in', async (req, res) => {
    const user = signedInUser(req)
    const parsed = parseOrThrow(preferencesBodySchema, req.body ?? {})
    await users.setUnits(user.id, parsed.units)
    res.json({ ...user, units: parsed.units })
  })

  return api
}
