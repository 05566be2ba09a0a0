// A server-paged table (v-data-table-server): its rows, total, loading and error state, the page
// options, and a search box that goes back to page 1 a moment after typing stops.
import { ref, shallowRef, watch, type Ref } from 'vue'
import type { Page } from '@shared/contracts/admin.contract'
import { toApiFailure } from '@/api/http'

export interface PageQuery {
  page: number
  pageSize: number
  search: string | undefined
}

const SEARCH_DELAY_MS = 250

export function usePagedTable<T>(fetchPage: (query: PageQuery) => Promise<Page<T>>) {
  const items: Ref<T[]> = shallowRef([])
  const total = ref(0)
  const loading = ref(false)
  const failure = ref<string | null>(null)
  const search = ref('')
  const options = ref({ page: 1, itemsPerPage: 25 })

  async function load(): Promise<void> {
    loading.value = true
    failure.value = null
    try {
      const page = await fetchPage({ page: options.value.page, pageSize: options.value.itemsPerPage, search: search.value.trim() || undefined })
      items.value = page.items
      total.value = page.total
    } catch (error) {
      failure.value = toApiFailure(error).message
    } finally {
      loading.value = false
    }
  }

  /** The table asked for another page or page size. */
  function onOptions(next: { page: number; itemsPerPage: number }): void {
    options.value = { page: next.page, itemsPerPage: next.itemsPerPage }
    void load()
  }

  /** A filter changed: back to page 1. */
  function restart(): void {
    options.value = { ...options.value, page: 1 }
    void load()
  }

  let timer: ReturnType<typeof setTimeout> | undefined
  watch(search, () => {
    clearTimeout(timer)
    timer = setTimeout(restart, SEARCH_DELAY_MS)
  })

  return { items, total, loading, failure, search, options, load, onOptions, restart }
}
