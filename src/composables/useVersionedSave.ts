// The save of an edit dialog whose record carries a version: the server answers 409 when someone
// else saved it meanwhile, and the dialog then offers to reload instead of saving over their work.
import { ref, type Ref } from 'vue'
import { toApiFailure } from '@/api/http'

export interface VersionedSave<T> {
  busy: Ref<boolean>
  /** The server's message for the last failed save, or null. */
  failure: Ref<string | null>
  /** Field errors of the last failed save, by the server's field path. */
  fields: Ref<Record<string, string>>
  /** The last save met a newer version (409): saving again would overwrite; reload instead. */
  stale: Ref<boolean>
  /** Clears the last save's outcome (when the dialog opens). */
  reset(): void
  /** Runs the save; on success hands the answer to `saved` and closes the dialog. */
  save(run: () => Promise<T>): Promise<void>
  /** Closes the dialog and asks its owner to load the record again. */
  reload(): void
}

export function useVersionedSave<T>(open: Ref<boolean>, saved: (value: T) => void, staleReload: () => void): VersionedSave<T> {
  const busy = ref(false)
  const failure = ref<string | null>(null)
  const fields = ref<Record<string, string>>({})
  const stale = ref(false)

  function reset(): void {
    failure.value = null
    fields.value = {}
    stale.value = false
  }

  async function save(run: () => Promise<T>): Promise<void> {
    busy.value = true
    failure.value = null
    fields.value = {}
    try {
      saved(await run())
      open.value = false
    } catch (error) {
      const problem = toApiFailure(error)
      failure.value = problem.message
      fields.value = problem.fields
      stale.value = problem.status === 409
    } finally {
      busy.value = false
    }
  }

  function reload(): void {
    staleReload()
    open.value = false
  }

  return { busy, failure, fields, stale, reset, save, reload }
}
