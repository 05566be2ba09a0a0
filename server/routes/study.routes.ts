import { z } from 'zod'
import { pageQuerySchema } from '../../shared/contracts/admin.contract'
import { unitSystemSchema } from '../../shared/contracts/auth.contract'
import { studyCreateSchema, studyUpdateSchema } from '../../shared/contracts/study.contract'
import { ApiRouter } from '../http/api-router'
import { UnauthorizedError } from '../http/errors'
import { parseOrThrow } from '../http/validate'
import type { StudyService } from '../services/study.service'
import type { Request } from 'express'
import type { SessionUser } from '../../shared/contracts/auth.contract'

const idParams = z.object({ id: z.uuid({ error: 'not a study id' }) })
const runParams = z.object({ id: z.uuid({ error: 'not a study id' }), runId: z.uuid({ error: 'not a run id' }) })
const tokenParams = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{20,64}$/, { error: 'not a share link' }) })
const exportQuery = z.object({ units: unitSystemSchema.default('si') })

function user(req: Request): SessionUser {
  if (!req.user) throw new UnauthorizedError()
  return req.user
}

const anyone = ['buyer', 'sales', 'admin'] as const

export function studyRoutes(studies: StudyService): ApiRouter {
  const api = new ApiRouter('/v1')

  // Anonymous visitors may run a study without saving it; results carry no prices.
  api.post('/studies/preview-run', 'public', async (req, res) => {
    const { input } = parseOrThrow(studyCreateSchema, req.body)
    res.type('application/json').send((await studies.solveRun(input)).json())
  })

  api.get('/studies', anyone, async (req, res) => {
    const query = parseOrThrow(pageQuerySchema, req.query, 'query')
    res.json(await studies.list(user(req), query.page, query.pageSize, query.search))
  })

  api.post('/studies', anyone, async (req, res) => {
    const { input } = parseOrThrow(studyCreateSchema, req.body)
    res.status(201).json(await studies.create(user(req), input))
  })

  api.get('/studies/:id', anyone, async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    res.json(await studies.get(user(req), id))
  })

  api.put('/studies/:id', anyone, async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    const { input, version } = parseOrThrow(studyUpdateSchema, req.body)
    res.json(await studies.update(user(req), id, input, version))
  })

  api.delete('/studies/:id', anyone, async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    await studies.remove(user(req), id)
    res.status(204).end()
  })

  api.post('/studies/:id/runs', anyone, async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    res.status(201).json(await studies.run(user(req), id))
  })

  api.get('/studies/:id/runs/:runId', anyone, async (req, res) => {
    const { id, runId } = parseOrThrow(runParams, req.params, 'params')
    res.json(await studies.getRun(user(req), id, runId))
  })

  api.get('/studies/:id/runs/:runId/export.csv', anyone, async (req, res) => {
    const { id, runId } = parseOrThrow(runParams, req.params, 'params')
    const { units } = parseOrThrow(exportQuery, req.query, 'query')
    const { name, csv } = await studies.exportCsv(user(req), id, runId, units)
    res.setHeader('Content-Type', 'text/csv; charset=utf-8')
    res.setHeader('Content-Disposition', `attachment; filename="${name}"`)
    res.send(csv)
  })

  api.post('/studies/:id/share', anyone, async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    res.json(await studies.share(user(req), id, true))
  })

  api.delete('/studies/:id/share', anyone, async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    res.json(await studies.share(user(req), id, false))
  })

  api.get('/shared/studies/:token', anyone, async (req, res) => {
    const { token } = parseOrThrow(tokenParams, req.params, 'params')
    res.json(await studies.shared(user(req), token))
  })

  return api
}
