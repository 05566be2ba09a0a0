/**
 * Duty study runs over the catalogue in worker threads: each worker holds a share of the
 * catalogue (every n-th entry) and ranks it; the app merges the shares' best, asks each worker to
 * build the picked candidates, and assembles the answer (the merge is shared/selection's, and its
 * spec shows the merged answer equals the single-thread one). On a machine with more than one
 * core this cuts a big catalogue's run time nearly by the number of workers, and the app's event
 * loop stays free for other requests while a study runs.
 */
import { availableParallelism } from 'node:os'
import { Worker } from 'node:worker_threads'
import type { StudyInput } from '../../shared/contracts/study.contract'
import { EngineeringInputError } from '../../shared/engineering'
import { StudyInputError } from '../../shared/selection/air'
import {
  CANDIDATE_LIMIT,
  assembleResult,
  mergeShares,
  picksByShare,
  studyFrame,
  type CatalogueSource,
  type RankedShare,
  type SelectionResult,
} from '../../shared/selection/run-selection'
import type { BuiltShareText, FromWorker, ToWorker, WorkerError } from './selection-protocol'

/** One worker per core, at most 4; none on a single core (the app's thread is then the only one). */
export function defaultSelectionWorkers(): number {
  const cores = availableParallelism()
  return cores < 2 ? 0 : Math.min(4, cores)
}

/** The pool failed (a worker stopped or answered nonsense): the caller may run the study in-process instead. */
export class SelectionPoolError extends Error {}

type Reply = Extract<FromWorker, { ok: true }>

interface Waiting {
  resolve: (reply: Reply) => void
  reject: (error: Error) => void
}

class SelectionWorker {
  private readonly worker: Worker
  private readonly waiting = new Map<number, Waiting>()
  /** The catalogue revision sent to this worker (messages are handled in order, so a rank after it sees it). */
  revision = -1
  alive = true

  constructor(onStop: (worker: SelectionWorker) => void) {
    this.worker = new Worker(new URL('./selection-worker.mjs', import.meta.url))
    // A pool left open must not keep the process alive.
    this.worker.unref()
    this.worker.on('message', (reply: FromWorker) => {
      const waiting = this.waiting.get(reply.id)
      if (!waiting) return
      this.waiting.delete(reply.id)
      if (reply.ok) waiting.resolve(reply)
      else waiting.reject(errorFrom(reply.error))
    })
    const stop = (reason: string) => {
      if (!this.alive) return
      this.alive = false
      for (const waiting of this.waiting.values()) waiting.reject(new SelectionPoolError(`selection worker stopped: ${reason}`))
      this.waiting.clear()
      onStop(this)
    }
    this.worker.on('error', (error) => stop(error.message))
    this.worker.on('exit', (code) => stop(`exit code ${code}`))
  }

  post(message: ToWorker): void {
    this.worker.postMessage(message)
  }

  request(message: Extract<ToWorker, { id: number }>): Promise<Reply> {
    if (!this.alive) return Promise.reject(new SelectionPoolError('selection worker stopped'))
    return new Promise((resolve, reject) => {
      this.waiting.set(message.id, { resolve, reject })
      this.worker.postMessage(message)
    })
  }

  terminate(): Promise<number> {
    this.alive = false
    return this.worker.terminate()
  }
}

function errorFrom(error: WorkerError): Error {
  if (error.kind === 'study-input') return new StudyInputError(error.field, error.message)
  if (error.kind === 'engineering-input') return new EngineeringInputError(error.field, error.message)
  return new SelectionPoolError(`selection worker failed: ${error.message}`)
}

/** An entry as plain data, also when given prepared (prepared motors are class instances a worker builds for itself). */
function sourceOf(entry: CatalogueSource): CatalogueSource {
  return {
    ...entry,
    performance: entry.performance.map((row) => ({ id: row.id, tap: row.tap, volts: row.volts, hz: row.hz, referenceTempC: row.referenceTempC, motor: row.motor })),
  }
}

/** The answer's text: its counts and load curve (assembled without candidates) with the shares' pieces in rank order. */
function stitchResult(frame: SelectionResult, built: readonly BuiltShareText[]): string {
  const inOrder = (pieces: Array<[number, string]>) => pieces.sort((a, b) => a[0] - b[0]).map((piece) => piece[1]).join(',')
  const { candidates: _candidates, curves: _curves, ...rest } = frame
  const head = JSON.stringify(rest)
  const candidates = inOrder(built.flatMap((share) => share.candidates))
  const curves = inOrder(built.flatMap((share) => share.curves))
  return `${head.slice(0, -1)},"candidates":[${candidates}],"curves":[${curves}]}`
}

export class SelectionPool {
  private workers: SelectionWorker[] = []
  private nextId = 1
  /** The last catalogue shared out, and its shares (one per worker). */
  private shared: { entries: readonly CatalogueSource[]; shares: CatalogueSource[][] } | undefined
  private closed = false

  constructor(private readonly size: number) {
    if (!Number.isInteger(size) || size < 1) throw new Error(`a selection pool needs at least one worker, not ${size}`)
  }

  private ensureWorkers(): SelectionWorker[] {
    if (this.closed) throw new SelectionPoolError('the selection pool is closed')
    while (this.workers.length < this.size) {
      this.workers.push(new SelectionWorker((stopped) => (this.workers = this.workers.filter((worker) => worker !== stopped))))
    }
    return this.workers
  }

  private sharesOf(entries: readonly CatalogueSource[]): CatalogueSource[][] {
    if (this.shared?.entries === entries && this.shared.shares.length === this.size) return this.shared.shares
    const shares: CatalogueSource[][] = Array.from({ length: this.size }, () => [])
    // Entries spread by a multiplicative hash of their place (Knuth's 2654435761, high bits):
    // families and sizes sit together in part-number order, and an even mix keeps the shares' work even.
    entries.forEach((entry, index) => shares[Math.floor((((index * 2654435761) >>> 0) / 2 ** 32) * this.size)]?.push(sourceOf(entry)))
    this.shared = { entries, shares }
    return shares
  }

  /**
   * One study over the catalogue of `revision`, answered as the JSON text of its SelectionResult
   * (the same figures as runSelection(); the spec parses and compares them). Field errors of the
   * study come back as StudyInputError or EngineeringInputError, as from runSelection(); anything
   * else the pool hits is a SelectionPoolError.
   */
  async runJson(revision: number, entries: readonly CatalogueSource[], input: StudyInput, limit = CANDIDATE_LIMIT): Promise<string> {
    const frame = studyFrame(input)
    const workers = this.ensureWorkers()
    const shares = this.sharesOf(entries)
    workers.forEach((worker, index) => {
      if (worker.revision === revision) return
      worker.post({ type: 'load', revision, entries: shares[index] ?? [] })
      worker.revision = revision
    })
    const id = this.nextId++
    try {
      const ranked = await Promise.all(workers.map((worker) => worker.request({ type: 'rank', id, revision, input, limit })))
      const rankedShares: RankedShare[] = ranked.map((reply) => {
        if (!('share' in reply)) throw new SelectionPoolError('a selection worker answered a rank without its share')
        return reply.share
      })
      const picks = picksByShare(mergeShares(rankedShares, limit), workers.length)
      const builds = await Promise.all(workers.map((worker, index) => worker.request({ type: 'build', id, picks: picks[index] ?? [] })))
      const built: BuiltShareText[] = builds.map((reply) => {
        if (!('built' in reply)) throw new SelectionPoolError('a selection worker answered a build without its candidates')
        return reply.built
      })
      return stitchResult(assembleResult(frame, rankedShares, []), built)
    } catch (error) {
      for (const worker of workers) if (worker.alive) worker.post({ type: 'drop', id })
      throw error
    }
  }

  async close(): Promise<void> {
    this.closed = true
    const workers = this.workers
    this.workers = []
    await Promise.all(workers.map((worker) => worker.terminate()))
  }
}
