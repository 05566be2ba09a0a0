/**
 * A selection worker thread: holds its share of the catalogue, prepared, and ranks or builds it
 * for one study at a time on the pool's request (selection-pool.ts). Started by selection-worker.mjs.
 */
import { parentPort } from 'node:worker_threads'
import { EngineeringInputError } from '../../shared/engineering'
import { StudyInputError } from '../../shared/selection/air'
import { prepareEntry, rankCatalogue, studyFrame, type CatalogueEntry, type ShareRanking } from '../../shared/selection/run-selection'
import type { FromWorker, ToWorker, WorkerError } from './selection-protocol'

/** Rankings waiting for their build step; a request the pool gave up on is dropped after this many. */
const KEPT_RANKINGS = 64

let revision = -1
let entries: CatalogueEntry[] = []
const rankings = new Map<number, ShareRanking>()

function errorOf(error: unknown): WorkerError {
  if (error instanceof StudyInputError) return { kind: 'study-input', field: error.field, message: error.message }
  if (error instanceof EngineeringInputError) return { kind: 'engineering-input', field: error.field, message: error.message }
  return { kind: 'internal', field: '', message: error instanceof Error ? (error.stack ?? error.message) : String(error) }
}

function handle(message: ToWorker): FromWorker | undefined {
  switch (message.type) {
    case 'load':
      revision = message.revision
      entries = message.entries.map((source) =>
        prepareEntry(source, (row, error) => console.error(`performance ${row.id} of ${source.partNumber} skipped: ${error instanceof Error ? error.message : String(error)}`)),
      )
      return undefined
    case 'rank': {
      if (message.revision !== revision) throw new Error(`asked to rank revision ${message.revision} holding ${revision}`)
      const ranking = rankCatalogue(entries, studyFrame(message.input), { limit: message.limit })
      rankings.set(message.id, ranking)
      if (rankings.size > KEPT_RANKINGS) rankings.delete(rankings.keys().next().value ?? message.id)
      return { id: message.id, ok: true, share: ranking.share }
    }
    case 'build': {
      const ranking = rankings.get(message.id)
      if (!ranking) throw new Error(`no ranking ${message.id} to build`)
      rankings.delete(message.id)
      const built = ranking.build(message.picks)
      return {
        id: message.id,
        ok: true,
        built: {
          candidates: built.candidates.map((candidate) => [candidate.rank, JSON.stringify(candidate)]),
          curves: built.curves.map((item) => [item.rank, JSON.stringify(item.curves)]),
        },
      }
    }
    case 'drop':
      rankings.delete(message.id)
      return undefined
  }
}

const port = parentPort
if (!port) throw new Error('selection-worker.ts runs as a worker thread')
port.on('message', (message: ToWorker) => {
  try {
    const reply = handle(message)
    if (reply) port.postMessage(reply)
  } catch (error) {
    if ('id' in message) port.postMessage({ id: message.id, ok: false, error: errorOf(error) } satisfies FromWorker)
    else throw error
  }
})
