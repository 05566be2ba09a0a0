// Express handler of POST /api/payments/webhook. Mounted on the app with express.raw() before the
// API router (which parses JSON and checks CSRF), because the signature covers the exact bytes.
import type { RequestHandler } from 'express'
import { AppError } from '../http/errors'
import type { PaymentWebhookService } from './webhook.service'

export const WEBHOOK_PATH = '/api/payments/webhook'

export function paymentWebhookHandler(webhooks: PaymentWebhookService): RequestHandler {
  return async (req, res) => {
    const body: unknown = req.body
    if (!Buffer.isBuffer(body)) throw new AppError(400, 'bad_payload', 'A webhook must be a JSON body (Content-Type: application/json)')
    const event = webhooks.verify(body, req.get('stripe-signature'))
    const outcome = await webhooks.handle(event)
    res.json({ received: true, duplicate: outcome.duplicate })
  }
}
