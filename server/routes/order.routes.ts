import { z } from 'zod'
import type { Request } from 'express'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import { orderListQuerySchema } from '../../shared/contracts/payment.contract'
import { ApiRouter } from '../http/api-router'
import { UnauthorizedError } from '../http/errors'
import { parseOrThrow } from '../http/validate'
import type { OrderService } from '../payments/order.service'

const idParams = z.object({ id: z.uuid({ error: 'not an order id' }) })

function user(req: Request): SessionUser {
  if (!req.user) throw new UnauthorizedError()
  return req.user
}

/** Sales orders: sales and admin see all, a buyer those of their organisation. */
export function orderRoutes(orders: OrderService): ApiRouter {
  const api = new ApiRouter('/v1')

  api.get('/orders', ['buyer', 'sales', 'admin'], async (req, res) => {
    const query = parseOrThrow(orderListQuerySchema, req.query, 'query')
    res.json(await orders.list(user(req), query))
  })

  api.get('/orders/:id', ['buyer', 'sales', 'admin'], async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    res.json(await orders.get(user(req), id))
  })

  api.post('/orders/:id/confirm', ['sales', 'admin'], async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    res.json(await orders.confirm(user(req), id))
  })

  return api
}
