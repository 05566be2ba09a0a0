// The admin's organisation routes: customer organisations with their account terms.
import { idParamsSchema, organisationBodySchema, organisationListQuerySchema, organisationUpdateBodySchema } from '../../shared/contracts/admin.contract'
import { ApiRouter } from '../http/api-router'
import { parseOrThrow } from '../http/validate'
import type { AdminOrganisationService } from '../services/admin-organisations.service'
import { actorOf } from './admin-users.routes'

export function adminOrganisationRoutes(organisations: AdminOrganisationService): ApiRouter {
  const api = new ApiRouter('/admin')

  api.get('/organisations', ['admin'], async (req, res) => {
    res.json(await organisations.list(parseOrThrow(organisationListQuerySchema, req.query, 'query')))
  })

  api.get('/organisations/:id', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    res.json(await organisations.get(id))
  })

  api.post('/organisations', ['admin'], async (req, res) => {
    const body = parseOrThrow(organisationBodySchema, req.body ?? {})
    res.status(201).json(await organisations.create(actorOf(req), body))
  })

  api.put('/organisations/:id', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    const body = parseOrThrow(organisationUpdateBodySchema, req.body ?? {})
    res.json(await organisations.update(actorOf(req), id, body))
  })

  api.get('/sales-engineers', ['admin'], async (_req, res) => {
    res.json(await organisations.salesEngineers())
  })

  return api
}
