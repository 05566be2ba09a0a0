/**
 * `npm run bench`: Spinwright's benchmarks. One JSON object per line as each figure is measured,
 * then a table of figures against their targets. A benchmark reports; it always exits 0.
 *
 *   BENCH_ONLY=core,selection,load,client,documents   parts to run (default: all)
 *   BENCH_QUICK=1                                      shorter runs (5 s load runs, fewer samples)
 *
 * Parts other than "core" and the PDF run on a scratch stack of their own under .data/bench
 * (MariaDB on a free port with the demo seed, the SPA built into .data/bench/dist, the app on a
 * free loopback port), stopped at the end. docs/performance.md explains each figure.
 */
import { benchCore } from './bench/core'
import { benchPdf, benchImport } from './bench/documents'
import { benchClient } from './bench/client'
import { benchLoad } from './bench/load'
import { benchSelection } from './bench/selection'
import { startBenchStack, type BenchStack } from './bench/stack'
import { check, emit, machine, printTable, progress } from './bench/report'

const PARTS = ['core', 'selection', 'load', 'client', 'documents'] as const
type Part = (typeof PARTS)[number]
const isPart = (value: string): value is Part => PARTS.some((part) => part === value)

const requested = (process.env.BENCH_ONLY ?? PARTS.join(','))
  .split(',')
  .map((name) => name.trim())
  .filter((name) => name.length > 0)
const unknown = requested.filter((name) => !isPart(name))
if (unknown.length > 0) progress(`BENCH_ONLY: ignoring unknown part(s) ${unknown.join(', ')}; parts are ${PARTS.join(', ')}`)
const only = new Set(requested.filter(isPart))
const quick = process.env.BENCH_QUICK === '1'

/** Runs one part; a failing part is reported in the output and the table, and the others go on. */
async function part(name: string, run: () => Promise<void>): Promise<void> {
  progress(`bench: ${name} ...`)
  try {
    await run()
  } catch (error) {
    const message = (error instanceof Error ? error.message : String(error)).replace(/\s+/g, ' ')
    emit('error', { part: name, message })
    check(`${name}: did not complete`, message.slice(0, 60), 'completes', false)
  }
}

async function main(): Promise<void> {
  const started = new Date()
  emit('machine', { ...machine(), startedAt: started.toISOString(), quick, parts: [...only] })
  if (only.has('core')) await part('core', () => benchCore(quick))
  if (only.has('documents')) await part('documents (pdf)', () => benchPdf(quick))

  const needsStack = only.has('selection') || only.has('load') || only.has('client') || only.has('documents')
  let stack: BenchStack | undefined
  let stopping = false
  const stop = async () => {
    if (stopping) return
    stopping = true
    await stack?.stop()
  }
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.once(signal, () => {
      void stop().finally(() => process.exit(130))
    })
  }
  if (needsStack) {
    try {
      stack = await startBenchStack(only.has('client'))
    } catch (error) {
      const message = error instanceof Error ? error.message : String(error)
      emit('error', { part: 'stack', message })
      check('scratch stack: did not start', message.slice(0, 60), 'starts', false)
    }
  }
  try {
    const running = stack
    if (running) {
      // The client and load parts see the demo catalogue; selection grows it and shrinks it back;
      // the import (last) adds 10,000 variants for good.
      if (only.has('client')) await part('client', () => benchClient(running, quick))
      if (only.has('load')) await part('load', () => benchLoad(running, quick))
      if (only.has('selection')) await part('selection', () => benchSelection(running, quick))
      if (only.has('documents')) await part('documents (import)', () => benchImport(running))
    }
  } finally {
    await stop()
  }
  emit('done', { ...machine(), finishedAt: new Date().toISOString(), seconds: Math.round((Date.now() - started.getTime()) / 1000) })
  printTable()
}

main()
  .catch((error: unknown) => {
    console.error(error)
  })
  .finally(() => process.exit(0))
