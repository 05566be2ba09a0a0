import { existsSync } from 'node:fs'
import type { Request } from 'express'
import { z } from 'zod'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import { acceptanceSchema, quoteDraftSchema, quoteDraftUpdateSchema, quoteListQuerySchema, quoteRequestSchema, withdrawSchema } from '../../shared/contracts/quote.contract'
import { ApiRouter } from '../http/api-router'
import { NotFoundError, UnauthorizedError } from '../http/errors'
import { parseOrThrow } from '../http/validate'
import type { QuoteService } from '../services/quote.service'
import type { DataSource } from 'typeorm'
import { Organisation } from '../db/entities'

const idParams = z.object({ id: z.uuid({ error: 'not a quote id' }) })
const pdfParams = z.object({ id: z.uuid({ error: 'not a quote id' }), letter: z.string().regex(/^[A-Z]{1,2}$/, { error: 'a revision letter' }) })
const createSchema = z.strictObject({ organisationId: z.uuid({ error: 'choose a customer' }), draft: quoteDraftSchema })
const issueSchema = z.strictObject({ version: z.number().int().min(1) })

function user(req: Request): SessionUser {
  if (!req.user) throw new UnauthorizedError()
  return req.user
}

const staff = ['sales', 'admin'] as const
const everyone = ['buyer', 'sales', 'admin'] as const

export function quoteRoutes(quotes: QuoteService, dataSource: DataSource): ApiRouter {
  const api = new ApiRouter('/v1')

  api.get('/quotes', everyone, async (req, res) => {
    const query = parseOrThrow(quoteListQuerySchema, req.query, 'query')
    res.json(await quotes.list(user(req), query.page, query.pageSize, query.state))
  })

  api.post('/quotes/requests', ['buyer'], async (req, res) => {
    res.status(201).json(await quotes.request(user(req), parseOrThrow(quoteRequestSchema, req.body)))
  })

  api.post('/quotes', staff, async (req, res) => {
    const body = parseOrThrow(createSchema, req.body)
    res.status(201).json(await quotes.create(user(req), body.organisationId, body.draft))
  })

  api.get('/quotes/:id', everyone, async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    res.json(await quotes.get(user(req), id))
  })

  api.put('/quotes/:id/draft', staff, async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    const body = parseOrThrow(quoteDraftUpdateSchema, req.body)
    res.json(await quotes.updateDraft(user(req), id, body.draft, body.version))
  })

  api.post('/quotes/:id/issue', staff, async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    const { version } = parseOrThrow(issueSchema, req.body)
    res.json(await quotes.issue(user(req), id, version))
  })

  api.post('/quotes/:id/accept', ['buyer'], async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    res.json(await quotes.accept(user(req), id, parseOrThrow(acceptanceSchema, req.body)))
  })

  api.post('/quotes/:id/withdraw', everyone, async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    const body = parseOrThrow(withdrawSchema, req.body)
    res.json(await quotes.withdraw(user(req), id, body.reason, body.version))
  })

  api.get('/quotes/:id/revisions/:letter/pdf', everyone, async (req, res) => {
    const { id, letter } = parseOrThrow(pdfParams, req.params, 'params')
    const { revision, absolutePath } = await quotes.revisionDocument(user(req), id, letter)
    if (!absolutePath || !existsSync(absolutePath)) throw new NotFoundError('Quote PDF')
    res.setHeader('Content-Type', 'application/pdf')
    res.setHeader('Content-Disposition', `attachment; filename="${revision.fullNumber}.pdf"`)
    res.sendFile(absolutePath, { dotfiles: 'allow' })
  })

  // Customer accounts a sales engineer can quote to.
  api.get('/accounts', staff, async (_req, res) => {
    const accounts = await dataSource.getRepository(Organisation).find({ where: { kind: 'customer' }, order: { name: 'ASC' } })
    res.json(accounts.map((account) => ({ id: account.id, name: account.name, tier: account.tier, currency: account.currency })))
  })

  return api
}
