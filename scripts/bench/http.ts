// Small HTTP helpers on loopback: an anonymous session with its CSRF token, sign-in (over fetch),
// and a plain node:http POST for timed requests.
import http from 'node:http'
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

/** One connection kept open between timed requests, as a browser keeps its own. */
const keepAlive = new http.Agent({ keepAlive: true, maxSockets: 1 })

/**
 * POST with node:http and the whole body read into a string: the timed client. Node's fetch
 * (undici, over web streams) spent about 8 ms of its own per 300 kB answer on this machine, a
 * cost of the measuring client rather than of the server or the wire.
 */
export function postText(url: string, headers: Record<string, string>, body: string): Promise<{ status: number; text: string }> {
  return new Promise((resolve, reject) => {
    const request = http.request(url, { method: 'POST', agent: keepAlive, headers: { ...headers, 'content-length': Buffer.byteLength(body) } }, (response) => {
      const chunks: Buffer[] = []
      response.on('data', (chunk: Buffer) => chunks.push(chunk))
      response.on('end', () => resolve({ status: response.statusCode ?? 0, text: Buffer.concat(chunks).toString('utf8') }))
      response.on('error', reject)
    })
    request.on('error', reject)
    request.end(body)
  })
}
