import { z } from 'zod'
import type { Request } from 'express'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import { ApiRouter } from '../http/api-router'
import { UnauthorizedError } from '../http/errors'
import { parseOrThrow } from '../http/validate'
import type { DepositService } from '../payments/deposit.service'

const idParams = z.object({ id: z.uuid({ error: 'not a quote id' }) })

function user(req: Request): SessionUser {
  if (!req.user) throw new UnauthorizedError()
  return req.user
}

/** Deposits of accepted quotes. The signed webhook is not here: it is mounted on the app with a raw body parser. */
export function paymentRoutes(deposits: DepositService): ApiRouter {
  const api = new ApiRouter('/v1')

  // Only a buyer of the quote's organisation pays; anyone else is told the quote does not exist.
  api.post('/quotes/:id/deposit', ['buyer'], async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    const started = await deposits.start(user(req), id)
    res.status(started.reused ? 200 : 201).json(started)
  })

  api.get('/quotes/:id/deposit', ['buyer', 'sales', 'admin'], async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    res.setHeader('Cache-Control', 'no-store')
    res.json(await deposits.status(user(req), id))
  })

  return api
}
