/**
 * Messages between the app and its selection workers (selection-pool.ts, selection-worker.ts).
 * The catalogue travels as plain data: each worker prepares its own motors.
 */
import type { StudyInput } from '../../shared/contracts/study.contract'
import type { CatalogueSource, RankedShare, SharePick } from '../../shared/selection/run-selection'

export type ToWorker =
  | { type: 'load'; revision: number; entries: CatalogueSource[] }
  | { type: 'rank'; id: number; revision: number; input: StudyInput; limit: number }
  | { type: 'build'; id: number; picks: SharePick[] }
  | { type: 'drop'; id: number }

/**
 * A share's built candidates and curves as JSON text with their ranks: text crosses between
 * threads as one block, where the objects cost the structured clone about 10 ms per 500
 * candidates on each side, and the app stitches the answer from the pieces without parsing them.
 */
export interface BuiltShareText {
  candidates: Array<[rank: number, json: string]>
  curves: Array<[rank: number, json: string]>
}

export type WorkerError = { kind: 'study-input' | 'engineering-input' | 'internal'; field: string; message: string }

export type FromWorker =
  | { id: number; ok: true; share: RankedShare }
  | { id: number; ok: true; built: BuiltShareText }
  | { id: number; ok: false; error: WorkerError }
