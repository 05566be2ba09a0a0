// Wires the payment side (SDK client, deposits, webhook, orders) from the configuration.
import type { DataSource } from 'typeorm'
import type { Config } from '../config'
import { portalUrlFrom } from '../mail'
import { DepositService } from './deposit.service'
import { OrderService } from './order.service'
import { createStripeClient } from './stripe-client'
import { PaymentWebhookService } from './webhook.service'

export { DepositService } from './deposit.service'
export { OrderService } from './order.service'
export { PaymentWebhookService } from './webhook.service'
export { paymentWebhookHandler, WEBHOOK_PATH } from './webhook.handler'

export interface PaymentServices {
  deposits: DepositService
  orders: OrderService
  webhooks: PaymentWebhookService
}

export function createPaymentServices(config: Config, dataSource: DataSource, log: (error: unknown) => void): PaymentServices {
  const stripe = createStripeClient(config)
  const orders = new OrderService(dataSource)
  const publicUrl = portalUrlFrom(config)
  const webhooks = new PaymentWebhookService({ dataSource, stripe, webhookSecret: config.STRIPE_WEBHOOK_SECRET, orders, portalUrl: publicUrl, log })
  const deposits = new DepositService({ dataSource, stripe, publicUrl, log, reconcile: (sessionId) => webhooks.reconcile(sessionId) })
  return { orders, deposits, webhooks }
}
