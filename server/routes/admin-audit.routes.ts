// The admin's audit log: filtered and paged on the server.
import { auditQuerySchema } from '../../shared/contracts/admin.contract'
import { ApiRouter } from '../http/api-router'
import { parseOrThrow } from '../http/validate'
import type { AdminAuditService } from '../services/admin-audit.service'

export function adminAuditRoutes(audit: AdminAuditService): ApiRouter {
  const api = new ApiRouter('/admin')

  api.get('/audit', ['admin'], async (req, res) => {
    res.json(await audit.list(parseOrThrow(auditQuerySchema, req.query, 'query')))
  })

  api.get('/audit/facets', ['admin'], async (_req, res) => {
    res.json(await audit.facets())
  })

  return api
}
