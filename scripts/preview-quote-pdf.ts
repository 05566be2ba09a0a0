// Writes the sample quote PDF to .data/preview/quote.pdf (and a 20-line one beside it) so a person
// can look at it, and prints how long rendering takes. Run: npx tsx scripts/preview-quote-pdf.ts
import { mkdirSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { performance } from 'node:perf_hooks'
import { sampleQuoteDocument } from '../server/documents/quote-fixture'
import { renderQuotePdf } from '../server/documents/quote-pdf'

const outDir = join(process.cwd(), '.data', 'preview')
mkdirSync(outDir, { recursive: true })

const sample = await renderQuotePdf(sampleQuoteDocument())
writeFileSync(join(outDir, 'quote.pdf'), sample)

const twenty = sampleQuoteDocument({ lineCount: 20 })
await renderQuotePdf(twenty) // warm-up: font parsing and module loading are one-off costs
const runs: number[] = []
let long: Buffer = Buffer.alloc(0)
for (let i = 0; i < 5; i++) {
  const start = performance.now()
  long = await renderQuotePdf(twenty)
  runs.push(performance.now() - start)
}
writeFileSync(join(outDir, 'quote-20-lines.pdf'), long)
runs.sort((a, b) => a - b)
const median = runs[Math.floor(runs.length / 2)] ?? Number.NaN
console.log(`wrote ${join(outDir, 'quote.pdf')} (${sample.length} bytes) and quote-20-lines.pdf (${long.length} bytes)`)
console.log(`20-line render: median ${median.toFixed(0)} ms, fastest ${(runs[0] ?? Number.NaN).toFixed(0)} ms over ${runs.length} runs`)
