// The one HTTP client of the SPA. It adds the CSRF token to state-changing calls, retries once
// when the session's token has changed, and reports 401s so the app can send the user to sign-in.
import axios, { AxiosError, type AxiosRequestConfig } from 'axios'
import type { ApiErrorBody } from '@shared/contracts/auth.contract'

export const http = axios.create({ baseURL: '/api', withCredentials: true, timeout: 30_000 })

let csrfToken: string | undefined
let onUnauthorized: (() => void) | undefined

export function setUnauthorizedHandler(handler: () => void): void {
  onUnauthorized = handler
}

export function forgetCsrfToken(): void {
  csrfToken = undefined
}

async function freshCsrfToken(): Promise<string> {
  const response = await http.get<{ token: string }>('/auth/csrf')
  csrfToken = response.data.token
  return csrfToken
}

const SAFE = new Set(['get', 'head', 'options'])

http.interceptors.request.use(async (config) => {
  const method = (config.method ?? 'get').toLowerCase()
  if (!SAFE.has(method)) {
    config.headers.set('X-CSRF-Token', csrfToken ?? (await freshCsrfToken()))
  }
  return config
})

interface RetriableConfig extends AxiosRequestConfig {
  csrfRetried?: boolean
  quietUnauthorized?: boolean
}

http.interceptors.response.use(undefined, async (error: unknown) => {
  if (!(error instanceof AxiosError) || !error.response) throw error
  const config: RetriableConfig | undefined = error.config
  const body: Partial<ApiErrorBody> | undefined = error.response.data
  if (error.response.status === 403 && body?.error?.code === 'csrf_failed' && config && !config.csrfRetried) {
    config.csrfRetried = true
    await freshCsrfToken()
    return http.request(config)
  }
  if (error.response.status === 401 && !config?.quietUnauthorized) onUnauthorized?.()
  throw error
})

/** A failure as the screens show it: a message and, for forms, a reason per field. */
export interface ApiFailure {
  status: number
  code: string
  message: string
  fields: Record<string, string>
}

export function toApiFailure(error: unknown): ApiFailure {
  if (error instanceof AxiosError) {
    const body: Partial<ApiErrorBody> | undefined = error.response?.data
    if (body?.error) {
      return { status: error.response?.status ?? 0, code: body.error.code, message: body.error.message, fields: body.error.fields ?? {} }
    }
    if (!error.response) return { status: 0, code: 'network', message: 'The server cannot be reached; check your connection', fields: {} }
    return { status: error.response.status, code: 'http', message: `The server answered ${error.response.status}`, fields: {} }
  }
  return { status: 0, code: 'client', message: error instanceof Error ? error.message : String(error), fields: {} }
}

export type { RetriableConfig }
