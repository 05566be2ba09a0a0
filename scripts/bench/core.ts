// Part "core": runs scripts/bench-core.ts in a process of its own (one core, nothing else on its
// event loop) and reads its JSON lines.
import { spawn } from 'node:child_process'
import path from 'node:path'
import { check, emit, round } from './report'

interface CoreRow {
  case: string
  solvesPerSecond: number
  evaluationsMean: number
  evaluationsMax: number
  solves: number
}

function isCoreRow(value: unknown): value is CoreRow {
  return typeof value === 'object' && value !== null && 'case' in value && 'solvesPerSecond' in value && 'evaluationsMax' in value
}

function runChild(seconds: number): Promise<string> {
  return new Promise((resolve, reject) => {
    const tsx = path.join(process.cwd(), 'node_modules', '.bin', 'tsx')
    const child = spawn(tsx, ['--tsconfig', 'tsconfig.server.json', 'scripts/bench-core.ts', String(seconds)], { stdio: ['ignore', 'pipe', 'inherit'] })
    let out = ''
    child.stdout.on('data', (chunk: Buffer) => {
      out += chunk.toString()
    })
    child.once('error', reject)
    child.once('exit', (code) => (code === 0 ? resolve(out) : reject(new Error(`bench-core exited with code ${code}`))))
  })
}

export async function benchCore(quick: boolean): Promise<void> {
  const rows = (await runChild(quick ? 1 : 3))
    .split('\n')
    .filter((line) => line.startsWith('{'))
    .map((line): unknown => JSON.parse(line))
    .filter(isCoreRow)
  for (const row of rows) emit('core', { ...row, kind: row.case.startsWith('PSC') ? 'psc-circuit' : 'measured-curve' })
  const curve = rows.filter((row) => !row.case.startsWith('PSC'))
  const psc = rows.filter((row) => row.case.startsWith('PSC'))
  const slowest = (list: CoreRow[]) => Math.min(...list.map((row) => row.solvesPerSecond))
  const curveRate = slowest(curve)
  const pscRate = slowest(psc)
  const evalMax = Math.max(...rows.map((row) => row.evaluationsMax))
  const evalMean = Math.max(...rows.map((row) => row.evaluationsMean))
  emit('core-summary', { measuredSolvesPerSecondMin: curveRate, pscSolvesPerSecondMin: pscRate, evaluationsPerSolveMeanWorst: evalMean, evaluationsPerSolveMax: evalMax })
  check('core: measured-curve solves/s (slowest case)', curveRate.toLocaleString('en-US'), '>= 100,000', curveRate >= 100_000)
  check('core: PSC circuit solves/s (slowest case)', pscRate.toLocaleString('en-US'), '>= 20,000', pscRate >= 20_000)
  check('core: motor evaluations per solve', `mean ${round(evalMean, 1)}, max ${evalMax}`, '<= 25 (max)', evalMax <= 25)
}
