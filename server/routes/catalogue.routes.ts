import { z } from 'zod'
import { variantListQuerySchema, variantSpecSchema } from '../../shared/contracts/catalogue.contract'
import { ApiRouter } from '../http/api-router'
import { parseOrThrow } from '../http/validate'
import { sendJson } from '../http/send-json'
import type { CatalogueService } from '../services/catalogue.service'

const partParams = z.object({ partNumber: variantSpecSchema.shape.partNumber })

/** The catalogue is public: anonymous visitors browse it (there are no prices on it). */
export function catalogueRoutes(catalogue: CatalogueService): ApiRouter {
  const api = new ApiRouter('/v1/catalogue')

  api.get('/variants', 'public', async (req, res) => {
    sendJson(res, await catalogue.listVariants(parseOrThrow(variantListQuerySchema, req.query, 'query')))
  })

  api.get('/variants/:partNumber', 'public', async (req, res) => {
    const { partNumber } = parseOrThrow(partParams, req.params, 'params')
    sendJson(res, await catalogue.getVariant(partNumber))
  })

  api.get('/facets', 'public', async (_req, res) => {
    sendJson(res, await catalogue.facets())
  })

  api.get('/demo-fans', 'public', async (_req, res) => {
    res.json(await catalogue.demoFans())
  })

  return api
}
