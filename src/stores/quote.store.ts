// Quotes as the screens see them: records by id, the one open in the quote screen with its editable
// draft (sales), field errors from the server, the stale-edit conflict, and the deposit status the
// buyer's return page polls. Every amount comes from the server.
import { computed, reactive, ref } from 'vue'
import { defineStore } from 'pinia'
import type { Acceptance, QuoteDraft, QuoteRecord, QuoteRequest, QuoteState } from '@shared/contracts/quote.contract'
import { formatBasisPoints, formatMoney, isCurrencyCode } from '@shared/pricing'
import type { DepositStatusView } from '@shared/contracts/payment.contract'
import * as quotesApi from '@/api/quotes.api'
import * as depositsApi from '@/api/deposits.api'
import * as ordersApi from '@/api/orders.api'
import { toApiFailure, type ApiFailure } from '@/api/http'

/** Money of a quote for display; amounts are integer minor units from the server. */
export function money(minor: number | null | undefined, currency: string): string {
  if (minor === null || minor === undefined) return '–'
  return isCurrencyCode(currency) ? formatMoney(minor, currency) : `${minor} (minor units of ${currency})`
}

export function percent(basisPoints: number): string {
  return formatBasisPoints(basisPoints)
}

/** Our names for the states, with a colour and icon for the chip. */
export const QUOTE_STATE_LOOK: Readonly<Record<QuoteState, { label: string; color: string; icon: string; hint: string }>> = {
  requested: { label: 'Request received', color: 'info', icon: 'mdi-inbox-arrow-down-outline', hint: 'The buyer asked; no one has priced it yet' },
  drafting: { label: 'Being priced', color: 'secondary', icon: 'mdi-pencil-outline', hint: 'Sales is preparing the quote' },
  issued: { label: 'Issued', color: 'primary', icon: 'mdi-send-check-outline', hint: 'A frozen revision is with the buyer, awaiting acceptance' },
  accepted: { label: 'Accepted, deposit due', color: 'accent', icon: 'mdi-handshake-outline', hint: 'The buyer accepted; the deposit is not paid yet' },
  'deposit-paid': { label: 'Deposit paid', color: 'success', icon: 'mdi-cash-check', hint: 'The deposit arrived; the order awaits confirmation by sales' },
  ordered: { label: 'Order confirmed', color: 'success', icon: 'mdi-package-variant-closed-check', hint: 'Sales confirmed the order' },
  expired: { label: 'Lapsed', color: 'warning', icon: 'mdi-timer-off-outline', hint: 'The validity ran out before acceptance' },
  withdrawn: { label: 'Withdrawn', color: 'error', icon: 'mdi-close-circle-outline', hint: 'Withdrawn; it can no longer be accepted' },
}

export type QuoteBusy = 'load' | 'save' | 'issue' | 'accept' | 'withdraw' | 'deposit' | 'confirm' | null

function cloneDraft(draft: QuoteDraft): QuoteDraft {
  // Field by field: the record may be a reactive proxy, which structuredClone refuses.
  return { ...draft, lines: draft.lines.map((line) => ({ ...line, options: line.options.map((option) => ({ ...option })) })), nre: draft.nre.map((item) => ({ ...item })) }
}

/** A comparable form of a draft (key order as the editor builds it does not matter). */
function canonical(draft: QuoteDraft | null): string {
  if (!draft) return ''
  return JSON.stringify(draft, (_key, value: unknown) => {
    if (value && typeof value === 'object' && !Array.isArray(value)) {
      return Object.fromEntries(Object.entries(value).filter(([, v]) => v !== undefined).sort(([a], [b]) => a.localeCompare(b)))
    }
    return value
  })
}

export const useQuoteStore = defineStore('quote', () => {
  const byId = reactive<Record<string, QuoteRecord>>({})
  const currentId = ref<string | null>(null)
  /** The sales engineer's working copy of the open quote's draft. */
  const draft = ref<QuoteDraft | null>(null)
  const busy = ref<QuoteBusy>(null)
  const failure = ref<ApiFailure | null>(null)
  /** Field errors of the last save or issue (400 fields), keyed like `draft.lines.0.quantity`. */
  const submitErrors = ref<Record<string, string>>({})
  /** Set when a save or issue met a newer version (409 stale_version). */
  const stale = ref(false)
  const deposit = ref<DepositStatusView | null>(null)

  const current = computed<QuoteRecord | null>(() => (currentId.value ? (byId[currentId.value] ?? null) : null))
  const dirty = computed(() => draft.value !== null && canonical(draft.value) !== canonical(current.value?.draft ?? null))
  /** The server's errors of the saved draft plus those of the last failed call. */
  const fieldErrors = computed<Record<string, string>>(() => {
    const fields: Record<string, string> = {}
    for (const error of current.value?.draftErrors ?? []) fields[error.field] = error.message
    return { ...fields, ...submitErrors.value }
  })
  const editable = computed(() => {
    const state = current.value?.state
    return state === 'requested' || state === 'drafting' || state === 'issued'
  })

  function remember(record: QuoteRecord, resetDraft: boolean): QuoteRecord {
    byId[record.id] = record
    if (record.id === currentId.value && resetDraft) draft.value = record.draft ? cloneDraft(record.draft) : null
    return record
  }

  function fail(error: unknown): ApiFailure {
    const problem = toApiFailure(error)
    failure.value = problem
    if (problem.status === 409 && problem.code === 'stale_version') stale.value = true
    if (problem.status === 400) submitErrors.value = problem.fields
    return problem
  }

  async function run<T>(what: Exclude<QuoteBusy, null>, action: () => Promise<T>): Promise<T | null> {
    busy.value = what
    failure.value = null
    try {
      return await action()
    } catch (error) {
      fail(error)
      return null
    } finally {
      busy.value = null
    }
  }

  /** Opens a quote in the quote screen (and forgets the previous one's unsaved edits). */
  async function open(id: string): Promise<QuoteRecord | null> {
    currentId.value = id
    draft.value = null
    stale.value = false
    submitErrors.value = {}
    deposit.value = null
    return run('load', async () => remember(await quotesApi.getQuote(id), true))
  }

  /** Loads the newest version again, dropping local edits (after a conflict, or after paying). */
  async function reload(): Promise<QuoteRecord | null> {
    const id = currentId.value
    if (!id) return null
    stale.value = false
    submitErrors.value = {}
    return run('load', async () => remember(await quotesApi.getQuote(id), true))
  }

  async function save(): Promise<boolean> {
    const record = current.value
    const working = draft.value
    if (!record || !working) return false
    submitErrors.value = {}
    const saved = await run('save', async () => remember(await quotesApi.saveDraft(record.id, working, record.version), true))
    return saved !== null
  }

  /** Issues the saved draft (the caller saves unsaved edits first). */
  async function issue(): Promise<boolean> {
    const record = current.value
    if (!record) return false
    submitErrors.value = {}
    const issued = await run('issue', async () => remember(await quotesApi.issueQuote(record.id, record.version), true))
    return issued !== null
  }

  async function accept(acceptance: Acceptance): Promise<boolean> {
    const record = current.value
    if (!record) return false
    submitErrors.value = {}
    const accepted = await run('accept', async () => remember(await quotesApi.acceptQuote(record.id, acceptance), true))
    return accepted !== null
  }

  async function withdraw(reason: string): Promise<boolean> {
    const record = current.value
    if (!record) return false
    submitErrors.value = {}
    const withdrawn = await run('withdraw', async () => remember(await quotesApi.withdrawQuote(record.id, reason, record.version), true))
    return withdrawn !== null
  }

  /** Starts (or resumes) the deposit payment and answers the hosted page to send the browser to. */
  async function startDeposit(): Promise<string | null> {
    const record = current.value
    if (!record) return null
    const started = await run('deposit', () => depositsApi.startDeposit(record.id))
    return started?.url ?? null
  }

  async function refreshDeposit(): Promise<DepositStatusView | null> {
    const id = currentId.value
    if (!id) return null
    try {
      deposit.value = await depositsApi.getDepositStatus(id)
      return deposit.value
    } catch (error) {
      fail(error)
      return null
    }
  }

  /**
   * Polls the deposit until the signed webhook has marked it paid (the order then exists), or gives
   * up after `timeoutMs`. Answers whether it was paid; reloads the quote either way.
   */
  async function waitForDeposit(options: { intervalMs?: number; timeoutMs?: number; cancelled?: () => boolean } = {}): Promise<boolean> {
    const interval = options.intervalMs ?? 1500
    const deadline = Date.now() + (options.timeoutMs ?? 60_000)
    while (Date.now() < deadline && !options.cancelled?.()) {
      const status = await refreshDeposit()
      if (status && (status.deposit?.status === 'paid' || status.order)) {
        await reload()
        return true
      }
      await new Promise((resolve) => setTimeout(resolve, interval))
    }
    return false
  }

  async function confirmOrder(): Promise<boolean> {
    const id = currentId.value
    if (!id) return false
    const status = deposit.value?.order ? deposit.value : await refreshDeposit()
    const orderId = status?.order?.id
    if (!orderId) {
      failure.value = { status: 0, code: 'client', message: 'The order of this quote was not found; reload the page', fields: {} }
      return false
    }
    const done = await run('confirm', async () => {
      await ordersApi.confirmOrder(orderId)
      return remember(await quotesApi.getQuote(id), true)
    })
    return done !== null
  }

  // ---------------------------------------------------------------- outside the quote screen

  async function request(body: QuoteRequest): Promise<QuoteRecord> {
    return remember(await quotesApi.requestQuote(body), false)
  }

  async function create(organisationId: string, body: QuoteDraft): Promise<QuoteRecord> {
    return remember(await quotesApi.createQuote(organisationId, body), false)
  }

  function clearErrors(): void {
    failure.value = null
    submitErrors.value = {}
  }

  return {
    byId,
    currentId,
    draft,
    busy,
    failure,
    stale,
    deposit,
    current,
    dirty,
    fieldErrors,
    editable,
    open,
    reload,
    save,
    issue,
    accept,
    withdraw,
    startDeposit,
    refreshDeposit,
    waitForDeposit,
    confirmOrder,
    request,
    create,
    clearErrors,
  }
})
