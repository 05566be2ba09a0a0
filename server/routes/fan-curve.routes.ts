// Buyers' fan-curve CSV, read on the server: POST a file (multipart, field "file") or JSON { text },
// with the units to assume where the header names none. Public, like running a study.
import express from 'express'
import { fanCsvUnitsSchema, fanCurveParseBodySchema, MAX_FAN_CSV_BYTES } from '../../shared/contracts/import.contract'
import { ApiRouter } from '../http/api-router'
import { ValidationError } from '../http/errors'
import { parseOrThrow } from '../http/validate'
import { parseFanCurveCsv } from '../../shared/imports/fan-curve-csv'
import { csvText, singleFileUpload } from '../imports/upload'

export function fanCurveRoutes(): ApiRouter {
  const api = new ApiRouter('/v1/fan-curves')
  api.post('/parse', 'public', singleFileUpload(MAX_FAN_CSV_BYTES, 'A fan-curve file'), express.text({ type: 'text/*', limit: MAX_FAN_CSV_BYTES }), (req, res) => {
    if (req.file) {
      const units = parseOrThrow(fanCsvUnitsSchema, req.body ?? {})
      res.json(parseFanCurveCsv(csvText(req.file), units))
      return
    }
    if (typeof req.body === 'string') {
      res.json(parseFanCurveCsv(req.body, parseOrThrow(fanCsvUnitsSchema, req.query, 'query')))
      return
    }
    const body = parseOrThrow(fanCurveParseBodySchema, req.body ?? {})
    if (body.text === undefined) throw new ValidationError({ file: 'send the fan curve as a file (field "file") or as JSON { text }' })
    res.json(parseFanCurveCsv(body.text, { flow: body.flow, pressure: body.pressure, power: body.power }))
  })
  return api
}
