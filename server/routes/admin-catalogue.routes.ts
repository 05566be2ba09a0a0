// The admin's catalogue uploads: CSV import (template, preview, commit), performance data
// (preview, commit) and datasheets (list, upload, delete); plus the public datasheet download.
import { pipeline } from 'node:stream/promises'
import { z } from 'zod'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import { variantSpecSchema } from '../../shared/contracts/catalogue.contract'
import { batchParamsSchema, DATASHEET_MAX_BYTES, datasheetListQuerySchema, performanceUploadFieldsSchema } from '../../shared/contracts/import.contract'
import { ApiRouter } from '../http/api-router'
import { UnauthorizedError, ValidationError } from '../http/errors'
import { parseOrThrow } from '../http/validate'
import { contentDisposition, type DatasheetService } from '../files/datasheet.service'
import { catalogueTemplateCsv, type CatalogueImportService } from '../imports/catalogue-import.service'
import type { PerformanceUploadService } from '../imports/performance-upload.service'
import { csvText, singleFileUpload } from '../imports/upload'

const CATALOGUE_CSV_MAX_BYTES = 8 * 1024 * 1024
const PERFORMANCE_CSV_MAX_BYTES = 512 * 1024

function userOf(user: Express.User | undefined): SessionUser {
  if (!user) throw new UnauthorizedError()
  return user
}

const datasheetFieldsSchema = z.object({
  familyCode: z.string().trim().max(24).optional(),
  partNumber: z.string().trim().max(40).optional(),
})
const idParams = z.object({ id: z.uuid({ error: 'not a datasheet id' }) })

export interface AdminCatalogueServices {
  imports: CatalogueImportService
  performance: PerformanceUploadService
  datasheets: DatasheetService
}

export function adminCatalogueRoutes({ imports, performance, datasheets }: AdminCatalogueServices): ApiRouter {
  const api = new ApiRouter('/admin/catalogue')
  const admin = ['admin'] as const

  api.get('/import/template.csv', admin, (_req, res) => {
    res.set('Content-Type', 'text/csv; charset=utf-8')
    res.set('Content-Disposition', contentDisposition('spinwright-catalogue-template.csv'))
    res.send(catalogueTemplateCsv())
  })

  api.post('/import', admin, singleFileUpload(CATALOGUE_CSV_MAX_BYTES, 'A catalogue CSV'), async (req, res) => {
    const text = csvText(req.file)
    res.status(201).json(await imports.preview(req.file?.originalname ?? 'catalogue.csv', text, userOf(req.user)))
  })

  api.get('/import/batches/:id', admin, async (req, res) => {
    const { id } = parseOrThrow(batchParamsSchema, req.params, 'params')
    res.json(await imports.get(id))
  })

  api.post('/import/batches/:id/commit', admin, async (req, res) => {
    const { id } = parseOrThrow(batchParamsSchema, req.params, 'params')
    res.json(await imports.commit(id, userOf(req.user)))
  })

  api.post('/performance', admin, singleFileUpload(PERFORMANCE_CSV_MAX_BYTES, 'A performance file'), async (req, res) => {
    const fields = parseOrThrow(performanceUploadFieldsSchema, req.body ?? {})
    const text = csvText(req.file)
    res.status(201).json(await performance.preview(req.file?.originalname ?? 'performance.csv', text, fields, userOf(req.user)))
  })

  api.post('/performance/batches/:id/commit', admin, async (req, res) => {
    const { id } = parseOrThrow(batchParamsSchema, req.params, 'params')
    res.json(await performance.commit(id, userOf(req.user)))
  })

  api.get('/datasheets', admin, async (req, res) => {
    res.json({ items: await datasheets.list(parseOrThrow(datasheetListQuerySchema, req.query, 'query')) })
  })

  api.post('/datasheets', admin, singleFileUpload(DATASHEET_MAX_BYTES, 'Datasheets'), async (req, res) => {
    const fields = parseOrThrow(datasheetFieldsSchema, req.body ?? {})
    const familyCode = fields.familyCode || undefined
    const partNumber = fields.partNumber || undefined
    if ((familyCode === undefined) === (partNumber === undefined)) {
      throw new ValidationError({ partNumber: 'attach the datasheet to one variant (partNumber) or one family (familyCode)' })
    }
    const target = partNumber !== undefined ? { kind: 'variant' as const, partNumber } : { kind: 'family' as const, code: familyCode ?? '' }
    res.status(201).json(await datasheets.upload(req.file, target, userOf(req.user)))
  })

  api.delete('/datasheets/:id', admin, async (req, res) => {
    const { id } = parseOrThrow(idParams, req.params, 'params')
    await datasheets.remove(id, userOf(req.user))
    res.status(204).end()
  })

  return api
}

const downloadParams = z.object({ partNumber: variantSpecSchema.shape.partNumber, id: z.uuid({ error: 'not a datasheet id' }) })

/** Datasheet downloads: public, like the catalogue they belong to. */
export function datasheetDownloadRoutes(datasheets: DatasheetService): ApiRouter {
  const api = new ApiRouter('/v1/catalogue')
  api.get('/variants/:partNumber/datasheets/:id', 'public', async (req, res) => {
    const { partNumber, id } = parseOrThrow(downloadParams, req.params, 'params')
    const file = await datasheets.open(partNumber, id)
    res.set('Content-Type', 'application/pdf')
    res.set('Content-Disposition', contentDisposition(file.name))
    res.set('Content-Length', String(file.size))
    // An uploaded file never runs as part of the portal's pages.
    res.set('Content-Security-Policy', "sandbox; default-src 'none'")
    res.set('Cache-Control', 'private, max-age=300')
    await pipeline(file.stream, res)
  })
  return api
}
