// The admin's people routes: list, invite, resend, role, disable/enable, sales discount limit.
import type { Request } from 'express'
import {
  changeRoleBodySchema,
  discountLimitBodySchema,
  idParamsSchema,
  inviteUserBodySchema,
  userListQuerySchema,
} from '../../shared/contracts/admin.contract'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import { ApiRouter } from '../http/api-router'
import { UnauthorizedError } from '../http/errors'
import { parseOrThrow } from '../http/validate'
import type { AdminUserService } from '../services/admin-users.service'

/** The signed-in admin (the router has already refused anyone else). */
export function actorOf(req: Request): SessionUser {
  if (!req.user) throw new UnauthorizedError()
  return req.user
}

export function adminUserRoutes(users: AdminUserService): ApiRouter {
  const api = new ApiRouter('/admin')

  api.get('/users', ['admin'], async (req, res) => {
    res.json(await users.list(parseOrThrow(userListQuerySchema, req.query, 'query')))
  })

  api.get('/users/:id', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    res.json(await users.get(id))
  })

  api.post('/users', ['admin'], async (req, res) => {
    const body = parseOrThrow(inviteUserBodySchema, req.body ?? {})
    res.status(201).json(await users.invite(actorOf(req), body))
  })

  api.post('/users/:id/invitation', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    res.json(await users.resendInvitation(actorOf(req), id))
  })

  api.put('/users/:id/role', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    const body = parseOrThrow(changeRoleBodySchema, req.body ?? {})
    res.json(await users.changeRole(actorOf(req), id, body.role))
  })

  api.post('/users/:id/disable', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    res.json(await users.setDisabled(actorOf(req), id, true))
  })

  api.post('/users/:id/enable', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    res.json(await users.setDisabled(actorOf(req), id, false))
  })

  api.put('/users/:id/discount-limit', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    const body = parseOrThrow(discountLimitBodySchema, req.body ?? {})
    res.json(await users.setDiscountLimit(actorOf(req), id, body.discountLimitBp))
  })

  return api
}
