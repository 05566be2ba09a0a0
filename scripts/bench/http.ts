// Small HTTP helpers over fetch on loopback: an anonymous session with its CSRF token, sign-in.
import { z } from 'zod'

export interface Session {
  cookie: string
  csrf: string
}

const tokenSchema = z.object({ token: z.string().min(1) })

function cookieOf(response: Response, previous = ''): string {
  const fresh = response.headers.getSetCookie().map((line) => line.split(';')[0] ?? '').filter((pair) => pair.length > 0)
  return fresh.length > 0 ? fresh.join('; ') : previous
}

/** A new anonymous session: the cookie the server set and the CSRF token bound to it. */
export async function anonymousSession(baseUrl: string): Promise<Session> {
  const response = await fetch(`${baseUrl}/api/auth/csrf`)
  if (!response.ok) throw new Error(`GET /api/auth/csrf answered ${response.status}`)
  const { token } = tokenSchema.parse(await response.json())
  const cookie = cookieOf(response)
  if (!cookie) throw new Error('GET /api/auth/csrf set no session cookie')
  return { cookie, csrf: token }
}

/** Signs in (the session id changes at sign-in, so the cookie and token are read again). */
export async function signIn(baseUrl: string, email: string, password: string): Promise<Session> {
  const anonymous = await anonymousSession(baseUrl)
  const response = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', cookie: anonymous.cookie, 'x-csrf-token': anonymous.csrf },
    body: JSON.stringify({ email, password }),
  })
  if (!response.ok) throw new Error(`sign-in as ${email} answered ${response.status}: ${await response.text()}`)
  const cookie = cookieOf(response, anonymous.cookie)
  const again = await fetch(`${baseUrl}/api/auth/csrf`, { headers: { cookie } })
  const { token } = tokenSchema.parse(await again.json())
  return { cookie: cookieOf(again, cookie), csrf: token }
}

export function jsonHeaders(session: Session): Record<string, string> {
  return { 'content-type': 'application/json', cookie: session.cookie, 'x-csrf-token': session.csrf }
}
