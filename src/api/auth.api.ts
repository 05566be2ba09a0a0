import type { CsrfResponse, HealthResponse, SessionUser, SignInBody, UnitSystem } from '@shared/contracts/auth.contract'
import { forgetCsrfToken, http, type RetriableConfig } from './http'

const quiet: RetriableConfig = { quietUnauthorized: true }

export async function fetchSessionUser(): Promise<SessionUser | null> {
  try {
    const response = await http.get<SessionUser>('/auth/me', quiet)
    return response.data
  } catch (error) {
    if (error instanceof Error && 'status' in error && error.status === 401) return null
    throw error
  }
}

export async function signIn(body: SignInBody): Promise<SessionUser> {
  const response = await http.post<SessionUser>('/auth/sign-in', body, quiet)
  // The session id changed at sign-in; its CSRF token did too.
  forgetCsrfToken()
  return response.data
}

export async function signOut(): Promise<void> {
  await http.post('/auth/sign-out', {}, quiet)
  forgetCsrfToken()
}

export async function savePreferences(units: UnitSystem): Promise<SessionUser> {
  const response = await http.patch<SessionUser>('/auth/me/preferences', { units })
  return response.data
}

export async function fetchCsrf(): Promise<CsrfResponse> {
  return (await http.get<CsrfResponse>('/auth/csrf')).data
}

export async function fetchHealth(): Promise<HealthResponse> {
  return (await http.get<HealthResponse>('/health')).data
}
