// Writes the sample quote PDF to .data/preview/quote.pdf (and a stress case and a 20-line one beside it) so a person
// can look at it, and prints how long rendering takes. Run: npx tsx scripts/preview-quote-pdf.ts
import { mkdirSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { performance } from 'node:perf_hooks'
import { sampleQuoteDocument, stressQuoteDocument } from '../server/documents/quote-fixture'
import { renderQuotePdf } from '../server/documents/quote-pdf'

const outDir = join(process.cwd(), '.data', 'preview')
mkdirSync(outDir, { recursive: true })

const sample = await renderQuotePdf(sampleQuoteDocument())
writeFileSync(join(outDir, 'quote.pdf'), sample)
writeFileSync(join(outDir, 'quote-stress.pdf'), await renderQuotePdf(stressQuoteDocument()))

const twenty = sampleQuoteDocument({ lineCount: 20 })
await renderQuotePdf(twenty) // warm-up: font parsing and module loading are one-off costs
// Wall time suffers when other processes share the cores; CPU time of this process shows the cost.
const runs: number[] = []
const cpuRuns: number[] = []
let long: Buffer = Buffer.alloc(0)
for (let i = 0; i < 7; i++) {
  const cpu = process.cpuUsage()
  const start = performance.now()
  long = await renderQuotePdf(twenty)
  runs.push(performance.now() - start)
  const used = process.cpuUsage(cpu)
  cpuRuns.push((used.user + used.system) / 1000)
}
writeFileSync(join(outDir, 'quote-20-lines.pdf'), long)
const median = (values: number[]): number => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)] ?? Number.NaN
console.log(`wrote ${join(outDir, 'quote.pdf')} (${sample.length} bytes) quote-stress.pdf and quote-20-lines.pdf`)
console.log(
  `20-line render (${long.length} bytes): median ${median(runs).toFixed(0)} ms wall, fastest ${Math.min(...runs).toFixed(0)} ms; ` +
    `median ${median(cpuRuns).toFixed(0)} ms CPU over ${runs.length} runs`,
)
