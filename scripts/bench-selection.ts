// Benchmark: one duty study run over the demo catalogue (and a scaled copy), compute only, no
// database: median and p95 of `runSelection`. `npm run bench:selection`.
import { demoCatalogueEntries } from '../server/seed/demo-entries'
import { DEMO_FANS } from '../server/seed/demo-fans'
import { runSelection, type CatalogueEntry } from '../shared/selection/run-selection'
import { studyInputSchema } from '../shared/contracts/study.contract'

const entries = demoCatalogueEntries()
const fan = DEMO_FANS.find((item) => item.code.startsWith('RH-'))
if (!fan) throw new Error('no range-hood demo fan')
const input = studyInputSchema.parse({
  name: 'bench',
  fan: { source: 'curve', refRpm: fan.refRpm, refDensity: fan.refDensity, points: fan.points },
  duty: fan.suggestedDuty,
  system: {},
  supply: { volts: 120, hz: 60 },
  ambient: {},
  energy: {},
  constraints: { activeOnly: false },
  tolerance: {},
})

function measure(list: CatalogueEntry[], runs: number): { median: number; p95: number; candidates: number } {
  const times: number[] = []
  let candidates = 0
  for (let i = 0; i < runs; i += 1) {
    const started = performance.now()
    candidates = runSelection(list, input).candidates.length
    times.push(performance.now() - started)
  }
  times.sort((a, b) => a - b)
  return { median: times[Math.floor(runs / 2)] ?? 0, p95: times[Math.floor(runs * 0.95)] ?? 0, candidates }
}

measure(entries, 5)
for (const copies of [1, 4, 20]) {
  // Each copy prepares its own motors (as a catalogue of that size holds that many), under new part numbers.
  const list = copies === 1 ? entries : Array.from({ length: copies }, (_, copy) => demoCatalogueEntries().map((entry) => ({ ...entry, partNumber: `${entry.partNumber}-${copy}`, variantId: `${entry.variantId}-${copy}` }))).flat()
  const result = measure(list, copies > 4 ? 10 : 30)
  const line = { bench: 'selection-compute', variants: list.length, candidates: result.candidates, medianMs: Number(result.median.toFixed(2)), p95Ms: Number(result.p95.toFixed(2)) }
  console.log(JSON.stringify(line))
}
