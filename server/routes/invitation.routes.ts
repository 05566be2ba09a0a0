// Public invitation routes: check a set-password link, and set the password through it.
import { invitationTokenParamsSchema, setPasswordBodySchema } from '../../shared/contracts/admin.contract'
import { ApiRouter } from '../http/api-router'
import { parseOrThrow } from '../http/validate'
import type { InvitationService } from '../services/invitation.service'

export function invitationRoutes(invitations: InvitationService): ApiRouter {
  const api = new ApiRouter('/auth')

  api.get('/invitations/:token', 'public', async (req, res) => {
    const { token } = parseOrThrow(invitationTokenParamsSchema, req.params, 'params')
    res.set('Cache-Control', 'no-store')
    res.json(await invitations.check(token))
  })

  api.post('/invitations/:token', 'public', async (req, res) => {
    const { token } = parseOrThrow(invitationTokenParamsSchema, req.params, 'params')
    const body = parseOrThrow(setPasswordBodySchema, req.body ?? {})
    res.set('Cache-Control', 'no-store')
    res.json(await invitations.setPassword(token, body.password))
  })

  return api
}
