// Sends an object as JSON, serialising each object once: cached answers (the catalogue's, per
// revision) are sent many times, and their text is kept beside them for as long as they live.
import type { Response } from 'express'

const serialised = new WeakMap<object, string>()

export function sendJson(res: Response, value: object): void {
  let body = serialised.get(value)
  if (body === undefined) {
    body = JSON.stringify(value)
    serialised.set(value, body)
  }
  res.type('application/json').send(body)
}
