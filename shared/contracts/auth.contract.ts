// Sign-in, session and account contracts shared by the API and the SPA.
import { z } from 'zod'

export const ROLES = ['admin', 'sales', 'buyer'] as const
export const roleSchema = z.enum(ROLES)
export type Role = z.infer<typeof roleSchema>

export const UNIT_SYSTEMS = ['si', 'us'] as const
export const unitSystemSchema = z.enum(UNIT_SYSTEMS)
export type UnitSystem = z.infer<typeof unitSystemSchema>

export const organisationKindSchema = z.enum(['maker', 'customer'])
export const customerTierSchema = z.enum(['oem', 'distributor'])
export type CustomerTier = z.infer<typeof customerTierSchema>

export const signInBodySchema = z.strictObject({
  email: z.email({ error: 'enter a valid e-mail address' }).max(254).transform((value) => value.toLowerCase()),
  password: z.string({ error: 'enter your password' }).min(1, { error: 'enter your password' }).max(200),
})
export type SignInBody = z.infer<typeof signInBodySchema>

export const preferencesBodySchema = z.strictObject({
  units: unitSystemSchema,
})
export type PreferencesBody = z.infer<typeof preferencesBodySchema>

export interface OrganisationSummary {
  id: string
  name: string
  kind: z.infer<typeof organisationKindSchema>
  tier: CustomerTier | null
}

export interface SessionUser {
  id: string
  email: string
  name: string
  role: Role
  units: UnitSystem
  organisation: OrganisationSummary
}

export interface CsrfResponse {
  token: string
}

export interface HealthResponse {
  status: 'ok' | 'error'
  database: 'ok' | 'unreachable'
  reason?: string
}

/** The one shape of every API failure. */
export interface ApiErrorBody {
  error: { code: string; message: string; fields?: Record<string, string> }
}
