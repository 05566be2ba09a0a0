// The admin's pricing routes: price lists (header, entries, copies) and the copper index.
import { z } from 'zod'
import {
  copperIndexBodySchema,
  copperIndexQuerySchema,
  copyPriceListBodySchema,
  idParamsSchema,
  pageQuerySchema,
  priceListEntriesQuerySchema,
  priceListEntryBodySchema,
  priceListHeaderBodySchema,
} from '../../shared/contracts/admin.contract'
import { ApiRouter } from '../http/api-router'
import { parseOrThrow } from '../http/validate'
import type { AdminPricingService } from '../services/admin-pricing.service'
import { actorOf } from './admin-users.routes'

const entryParams = idParamsSchema.extend({ entryId: z.uuid({ error: 'not a valid id' }) })

export function adminPricingRoutes(pricing: AdminPricingService): ApiRouter {
  const api = new ApiRouter('/admin')

  api.get('/price-lists', ['admin'], async (req, res) => {
    res.json(await pricing.listPriceLists(parseOrThrow(pageQuerySchema, req.query, 'query')))
  })

  api.get('/price-lists/:id', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    res.json(await pricing.getPriceList(id))
  })

  api.put('/price-lists/:id', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    const body = parseOrThrow(priceListHeaderBodySchema, req.body ?? {})
    res.json(await pricing.updateHeader(actorOf(req), id, body))
  })

  api.get('/price-lists/:id/entries', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    res.json(await pricing.listEntries(id, parseOrThrow(priceListEntriesQuerySchema, req.query, 'query')))
  })

  api.put('/price-lists/:id/entries/:entryId', ['admin'], async (req, res) => {
    const { id, entryId } = parseOrThrow(entryParams, req.params, 'params')
    const body = parseOrThrow(priceListEntryBodySchema, req.body ?? {})
    res.json(await pricing.updateEntry(actorOf(req), id, entryId, body))
  })

  api.post('/price-lists/:id/copy', ['admin'], async (req, res) => {
    const { id } = parseOrThrow(idParamsSchema, req.params, 'params')
    const body = parseOrThrow(copyPriceListBodySchema, req.body ?? {})
    res.status(201).json(await pricing.copyPriceList(actorOf(req), id, body))
  })

  api.get('/copper-index', ['admin'], async (req, res) => {
    const { currency } = parseOrThrow(copperIndexQuerySchema, req.query, 'query')
    res.json(await pricing.copperHistory(currency))
  })

  api.post('/copper-index', ['admin'], async (req, res) => {
    const body = parseOrThrow(copperIndexBodySchema, req.body ?? {})
    res.status(201).json(await pricing.addCopperValue(actorOf(req), body))
  })

  return api
}
