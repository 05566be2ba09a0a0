// An upload that is checked first and written only on commit (catalogue import, performance
// data): the server keeps the checked file as a batch; the preview shows what would change and
// the commit writes that batch. One failure slot for both steps.
import { ref, type Ref } from 'vue'
import { toApiFailure, type ApiFailure } from '@/api/http'

export interface StagedUpload<P extends { batchId: string }, C> {
  preview: Ref<P | null>
  committed: Ref<C | null>
  failure: Ref<ApiFailure | null>
  busy: Ref<'preview' | 'commit' | null>
  /** The commit's confirmation dialog is open. */
  confirming: Ref<boolean>
  /** Uploads for a preview (dropping any earlier preview and commit); true when it came back. */
  runPreview(upload: () => Promise<P>): Promise<boolean>
  /** Commits the previewed batch; `after` may update the preview once it is written. */
  commit(after?: (preview: P, committed: C) => P): Promise<void>
  reset(): void
}

export function useStagedUpload<P extends { batchId: string }, C>(commitBatch: (batchId: string) => Promise<C>): StagedUpload<P, C> {
  // Refs of the type parameters: Vue's ref() unwraps nested refs in its type, which these never hold.
  const preview: Ref<P | null> = ref(null)
  const committed: Ref<C | null> = ref(null)
  const failure = ref<ApiFailure | null>(null)
  const busy = ref<'preview' | 'commit' | null>(null)
  const confirming = ref(false)

  async function runPreview(upload: () => Promise<P>): Promise<boolean> {
    busy.value = 'preview'
    failure.value = null
    committed.value = null
    preview.value = null
    try {
      preview.value = await upload()
      return true
    } catch (error) {
      failure.value = toApiFailure(error)
      return false
    } finally {
      busy.value = null
    }
  }

  async function commit(after?: (preview: P, committed: C) => P): Promise<void> {
    const staged = preview.value
    if (!staged) return
    confirming.value = false
    busy.value = 'commit'
    failure.value = null
    try {
      const result = await commitBatch(staged.batchId)
      committed.value = result
      if (after) preview.value = after(staged, result)
    } catch (error) {
      failure.value = toApiFailure(error)
    } finally {
      busy.value = null
    }
  }

  function reset(): void {
    preview.value = null
    committed.value = null
    failure.value = null
  }

  return { preview, committed, failure, busy, confirming, runPreview, commit, reset }
}
