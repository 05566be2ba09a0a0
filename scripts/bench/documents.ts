// Part "documents": the quote PDF (20 lines, rendered in this process: wall and CPU time) and the
// admin's 10,000-row catalogue CSV import (preview, then commit) through the API as an admin.
import { existsSync } from 'node:fs'
import path from 'node:path'
import { z } from 'zod'
import { renderQuotePdf } from '../../server/documents/quote-pdf'
import { sampleQuoteDocument } from '../../server/documents/quote-fixture'
import { generateDemoCatalogue } from '../../server/seed/demo-catalogue'
import { DEMO_PASSWORD } from '../../server/seed/demo-users'
import type { BenchStack } from './stack'
import { signIn } from './http'
import { check, emit, median, percentile, round } from './report'

export async function benchPdf(quick: boolean): Promise<void> {
  const doc = sampleQuoteDocument({ lineCount: 20 })
  await renderQuotePdf(doc) // loads fonts and warms the code paths
  const runs = quick ? 5 : 10
  const wall: number[] = []
  const cpu: number[] = []
  let bytes = 0
  for (let i = 0; i < runs; i += 1) {
    const cpuStart = process.cpuUsage()
    const started = performance.now()
    const pdf = await renderQuotePdf(doc)
    wall.push(performance.now() - started)
    const used = process.cpuUsage(cpuStart)
    cpu.push((used.user + used.system) / 1000)
    bytes = pdf.length
  }
  const wallMs = round(median(wall), 1)
  emit('pdf', { lines: doc.lines.length, runs, wallMedianMs: wallMs, wallP95Ms: round(percentile(wall, 95), 1), cpuMedianMs: round(median(cpu), 1), pdfKb: round(bytes / 1024, 1) })
  check('documents: 20-line quote PDF (median)', `${wallMs} ms wall, ${round(median(cpu), 1)} ms CPU`, 'informational', undefined)
}

const IMPORT_ROWS = 10_000

/** 10,000 new variants: the demo variants again under new part numbers, in the import's own column set. */
async function importCsv(): Promise<string> {
  const { CATALOGUE_COLUMNS, FAMILY_CODE_COLUMN, PART_NUMBER_COLUMN, VARIANT_COLUMNS, csvLine, formatCell } = await import('../../server/imports/catalogue-columns')
  const { variants } = generateDemoCatalogue()
  const lines = [csvLine(CATALOGUE_COLUMNS)]
  for (let i = 0; i < IMPORT_ROWS; i += 1) {
    const variant = variants[i % variants.length]
    if (!variant) throw new Error('empty demo catalogue')
    const partNumber = `${variant.partNumber}-I${String(Math.floor(i / variants.length) + 1).padStart(3, '0')}`
    const cells = new Map<string, string>([
      [FAMILY_CODE_COLUMN, variant.familyCode],
      [PART_NUMBER_COLUMN, partNumber],
      ...VARIANT_COLUMNS.map((column): [string, string] => [column.name, formatCell(variant[column.field])]),
    ])
    // Family columns stay empty: the families exist and keep what the catalogue says.
    lines.push(csvLine(CATALOGUE_COLUMNS.map((name) => cells.get(name) ?? '')))
  }
  return `${lines.join('\r\n')}\r\n`
}

const previewSchema = z.object({ batchId: z.string(), committable: z.boolean(), counts: z.object({ rows: z.number(), add: z.number(), error: z.number() }) })
const commitSchema = z.object({ added: z.number(), changed: z.number(), catalogueRevision: z.number() })

export async function benchImport(stack: BenchStack): Promise<void> {
  const missing = ['server/imports/catalogue-import.service.ts', 'server/routes/admin-catalogue.routes.ts'].filter((file) => !existsSync(path.join(process.cwd(), file)))
  if (missing.length > 0) {
    emit('import', { skipped: true, reason: `the catalogue import API is not in the tree yet (${missing.join(', ')} missing)` })
    check('documents: 10,000-row import', 'skipped', 'informational', undefined)
    return
  }
  const text = await importCsv()
  const admin = await signIn(stack.baseUrl, 'admin@ashcombe.test', DEMO_PASSWORD)
  const form = new FormData()
  form.append('file', new Blob([text], { type: 'text/csv' }), 'bench-10000.csv')
  let started = performance.now()
  const previewResponse = await fetch(`${stack.baseUrl}/api/admin/catalogue/import`, { method: 'POST', headers: { cookie: admin.cookie, 'x-csrf-token': admin.csrf }, body: form })
  const previewText = await previewResponse.text()
  const previewMs = performance.now() - started
  if (previewResponse.status !== 201) {
    emit('import', { skipped: true, reason: `preview answered ${previewResponse.status}: ${previewText.slice(0, 300)}` })
    check('documents: 10,000-row import', `preview failed (${previewResponse.status})`, 'informational', undefined)
    return
  }
  const preview = previewSchema.parse(JSON.parse(previewText))
  started = performance.now()
  const commitResponse = await fetch(`${stack.baseUrl}/api/admin/catalogue/import/batches/${preview.batchId}/commit`, { method: 'POST', headers: { cookie: admin.cookie, 'x-csrf-token': admin.csrf } })
  const commitText = await commitResponse.text()
  const commitMs = performance.now() - started
  const commit = commitResponse.ok ? commitSchema.parse(JSON.parse(commitText)) : undefined
  emit('import', {
    rows: preview.counts.rows,
    add: preview.counts.add,
    rowErrors: preview.counts.error,
    fileKb: round(text.length / 1024, 0),
    previewMs: round(previewMs, 0),
    previewResponseKb: round(previewText.length / 1024, 0),
    commitStatus: commitResponse.status,
    commitMs: round(commitMs, 0),
    added: commit?.added ?? null,
    commitError: commit ? null : commitText.slice(0, 300),
  })
  check('documents: 10,000-row import preview', `${round(previewMs / 1000, 2)} s (${preview.counts.add} to add)`, 'informational', undefined)
  check('documents: 10,000-row import commit', commit ? `${round(commitMs / 1000, 2)} s (${commit.added} added)` : `failed (${commitResponse.status})`, 'commits, nothing partial', commit !== undefined && commit.added === preview.counts.add)
}
