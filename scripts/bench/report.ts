// What every benchmark part hands back: JSON lines as they are measured, and checks for the table.
import os from 'node:os'

/** One row of the closing table: a figure, its target and whether it met it. */
export interface Check {
  name: string
  value: string
  target: string
  /** undefined: informational, no target. */
  pass: boolean | undefined
}

const checks: Check[] = []

/** Prints one result as a JSON line (the machine-readable output). */
export function emit(bench: string, fields: Record<string, unknown>): void {
  process.stdout.write(`${JSON.stringify({ bench, ...fields })}\n`)
}

/** Progress for the person watching, on stderr so stdout stays JSON lines and the table. */
export function progress(message: string): void {
  process.stderr.write(`[bench] ${message}\n`)
}

export function check(name: string, value: string, target: string, pass: boolean | undefined): void {
  checks.push({ name, value, target, pass })
}

/** The machine and its load now: the figures mean little without them on a shared host. */
export function machine(): Record<string, unknown> {
  const cpus = os.cpus()
  return {
    cpuModel: cpus[0]?.model.trim() ?? 'unknown',
    cpus: cpus.length,
    memoryGb: Math.round(os.totalmem() / 2 ** 30),
    loadavg: os.loadavg().map((value) => Math.round(value * 100) / 100),
    node: process.version,
    platform: `${os.type()} ${os.release()}`,
  }
}

export function printTable(): void {
  const widths = [46, 30, 26]
  const line = (cells: string[]) => cells.map((cell, i) => cell.padEnd(widths[i] ?? 0)).join(' ').trimEnd()
  process.stdout.write(`\n${line(['name', 'value', 'target', 'result'])}\n`)
  process.stdout.write(`${'-'.repeat(112)}\n`)
  for (const c of checks) {
    const verdict = c.pass === undefined ? '' : c.pass ? 'pass' : 'FAIL'
    process.stdout.write(`${line([c.name, c.value, c.target, verdict])}\n`)
  }
  const judged = checks.filter((c) => c.pass !== undefined)
  process.stdout.write(`\n${judged.filter((c) => c.pass).length} of ${judged.length} targets met\n`)
}

// ---------------------------------------------------------------- statistics

/** Nearest-rank percentile (p in 0..100) of unsorted samples. */
export function percentile(samples: readonly number[], p: number): number {
  if (samples.length === 0) return Number.NaN
  const sorted = [...samples].sort((a, b) => a - b)
  const rank = Math.min(sorted.length, Math.max(1, Math.ceil((p / 100) * sorted.length)))
  return sorted[rank - 1] ?? Number.NaN
}

export const median = (samples: readonly number[]): number => percentile(samples, 50)

/** Rounds to `digits` decimals for printing. */
export function round(value: number, digits = 2): number {
  const f = 10 ** digits
  return Math.round(value * f) / f
}

/** Least-squares slope and intercept of y over x (for ms per 1,000 variants). */
export function linearFit(points: ReadonlyArray<{ x: number; y: number }>): { slope: number; intercept: number; r2: number } {
  const n = points.length
  const mx = points.reduce((s, p) => s + p.x, 0) / n
  const my = points.reduce((s, p) => s + p.y, 0) / n
  const sxx = points.reduce((s, p) => s + (p.x - mx) ** 2, 0)
  const sxy = points.reduce((s, p) => s + (p.x - mx) * (p.y - my), 0)
  const syy = points.reduce((s, p) => s + (p.y - my) ** 2, 0)
  const slope = sxx > 0 ? sxy / sxx : 0
  const r2 = sxx > 0 && syy > 0 ? (sxy * sxy) / (sxx * syy) : 1
  return { slope, intercept: my - slope * mx, r2 }
}
