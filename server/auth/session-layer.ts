// The session and passport's login state in front of the API, left out for a read that carries no
// session cookie. Such a request has no session to load: express-session would mint one per
// request (a random id, a hash of its contents) only to drop it unsaved (saveUninitialized is
// off), and passport would find nobody in it. Anonymous browsing of the catalogue is most of the
// portal's traffic, so that was a good part of each request's cost. Writes always get the layers
// (the CSRF guard refuses them without a session), as does the one read that starts a session.
import { Router, type RequestHandler } from 'express'

const READS = new Set(['GET', 'HEAD', 'OPTIONS'])

/** Whether the Cookie header names `cookieName` (a look-alike name only means the layers run). */
export function carriesCookie(header: string | undefined, cookieName: string): boolean {
  return header !== undefined && header.includes(`${cookieName}=`)
}

export function sessionLayer(cookieName: string, startsSession: (path: string) => boolean, layers: readonly RequestHandler[]): RequestHandler {
  const withSession = Router().use(...layers)
  return (req, res, next) => {
    if (READS.has(req.method) && !startsSession(req.path) && !carriesCookie(req.headers.cookie, cookieName)) return next()
    withSession(req, res, next)
  }
}
