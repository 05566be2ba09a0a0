// Administration contracts: users and invitations, customer organisations and their terms, price
// lists and the copper index, the audit log. The server validates with these; the SPA is typed by them.
import { z } from 'zod'
import { customerTierSchema, organisationKindSchema, roleSchema, type CustomerTier, type Role } from './auth.contract'
import { basisPointsSchema, currencyCodeSchema, nonNegativeMinorUnitsSchema } from './money.contract'

export const pageQuerySchema = z.object({
  page: z.coerce.number().int().min(1, { error: 'page starts at 1' }).default(1),
  pageSize: z.coerce.number().int().min(1).max(200, { error: 'at most 200 rows a page' }).default(25),
  search: z.string().trim().max(100).optional(),
})

export interface Page<T> {
  items: T[]
  total: number
  page: number
  pageSize: number
}

const uuid = z.uuid({ error: 'not a valid id' })
const isoDate = z.iso.date({ error: 'a date as YYYY-MM-DD' })
const personName = z.string({ error: 'enter a name' }).trim().min(1, { error: 'enter a name' }).max(160, { error: 'at most 160 characters' })
const emailAddress = z
  .email({ error: 'enter a valid e-mail address' })
  .max(254)
  .transform((value) => value.toLowerCase())
const version = z.number({ error: 'the version you loaded is missing' }).int().min(1)

export const idParamsSchema = z.object({ id: uuid })

// ---------------------------------------------------------------------------------------------
// Users and invitations

/** Roles that belong in the maker's own organisation; buyers belong in customer organisations. */
export const MAKER_ROLES: readonly Role[] = ['admin', 'sales']

/** Shortest password a person may set (invitation links and later changes). */
export const MIN_PASSWORD_LENGTH = 12

/** Hours an invitation link stays valid. */
export const INVITATION_HOURS = 72

export const USER_STATUSES = ['active', 'invited', 'disabled'] as const
export const userStatusSchema = z.enum(USER_STATUSES)
export type UserStatus = z.infer<typeof userStatusSchema>

export const userListQuerySchema = pageQuerySchema.extend({
  role: roleSchema.optional(),
  organisationId: uuid.optional(),
  status: userStatusSchema.optional(),
})
export type UserListQuery = z.infer<typeof userListQuerySchema>

export interface AdminUserRow {
  id: string
  email: string
  name: string
  role: Role
  organisation: string
  organisationId: string
  disabled: boolean
  /** active: can sign in; invited: no password yet; disabled: refused. */
  status: UserStatus
  discountLimitBp: number
  /** Expiry of the newest open invitation, when the user has not set a password yet. */
  invitationExpiresAt: string | null
  createdAt: string
}

export const inviteUserBodySchema = z.strictObject({
  name: personName,
  email: emailAddress,
  role: roleSchema,
  organisationId: uuid,
  discountLimitBp: basisPointsSchema.optional(),
})
export type InviteUserBody = z.infer<typeof inviteUserBodySchema>

export const changeRoleBodySchema = z.strictObject({ role: roleSchema })
export type ChangeRoleBody = z.infer<typeof changeRoleBodySchema>

export const discountLimitBodySchema = z.strictObject({ discountLimitBp: basisPointsSchema })
export type DiscountLimitBody = z.infer<typeof discountLimitBodySchema>

export const passwordSchema = z
  .string({ error: 'enter a password' })
  .min(MIN_PASSWORD_LENGTH, { error: `use at least ${MIN_PASSWORD_LENGTH} characters` })
  .max(200, { error: 'at most 200 characters' })

export const setPasswordBodySchema = z.strictObject({ password: passwordSchema })
export type SetPasswordBody = z.infer<typeof setPasswordBodySchema>

/** Invitation tokens are 32 random bytes in base64url (43 characters). */
export const invitationTokenParamsSchema = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{43}$/, { error: 'not an invitation link' }) })

/** What the set-password page shows about a valid link. */
export interface InvitationInfo {
  email: string
  name: string
  organisation: string
  expiresAt: string
}

export interface SetPasswordResult {
  email: string
}

// ---------------------------------------------------------------------------------------------
// Organisations and account terms

export const organisationListQuerySchema = pageQuerySchema.extend({
  kind: organisationKindSchema.optional(),
})
export type OrganisationListQuery = z.infer<typeof organisationListQuerySchema>

export interface AccountOverrideDto {
  /** null: the whole account. */
  variantId: string | null
  partNumber: string | null
  discountBp: number
}

export interface AdminOrganisationRow {
  id: string
  name: string
  kind: z.infer<typeof organisationKindSchema>
  tier: CustomerTier | null
  currency: string
  userCount: number
  priceList: { id: string; code: string; currency: string } | null
  salesEngineer: { id: string; name: string; email: string } | null
  overrides: AccountOverrideDto[]
  /** AccountTerms version for optimistic locking; null without terms (the maker). */
  version: number | null
  createdAt: string
}

export const accountOverrideInputSchema = z.strictObject({
  /** null or absent: the whole account. */
  partNumber: z.string().trim().min(1).max(40).nullable().optional(),
  discountBp: basisPointsSchema,
})

const overridesSchema = z
  .array(accountOverrideInputSchema)
  .max(500)
  .superRefine((items, context) => {
    const seen = new Set<string>()
    items.forEach((item, index) => {
      const key = item.partNumber ? item.partNumber.toUpperCase() : '(account)'
      if (seen.has(key)) {
        context.addIssue({ code: 'custom', path: [index, 'partNumber'], message: item.partNumber ? `${item.partNumber} is listed twice` : 'only one whole-account discount' })
      }
      seen.add(key)
    })
  })

export const organisationBodySchema = z.strictObject({
  name: z.string({ error: 'enter a name' }).trim().min(2, { error: 'at least 2 characters' }).max(160, { error: 'at most 160 characters' }),
  tier: customerTierSchema,
  currency: currencyCodeSchema,
  priceListId: uuid,
  salesEngineerId: uuid.nullable(),
  overrides: overridesSchema.default([]),
})
export type OrganisationBody = z.input<typeof organisationBodySchema>

export const organisationUpdateBodySchema = organisationBodySchema.extend({ version })
export type OrganisationUpdateBody = z.input<typeof organisationUpdateBodySchema>

export interface SalesEngineerOption {
  id: string
  name: string
  email: string
  discountLimitBp: number
}

// ---------------------------------------------------------------------------------------------
// Price lists and copper index

export interface TierDiscounts {
  oem: number
  distributor: number
}

export interface AdminPriceListRow {
  id: string
  code: string
  name: string
  currency: string
  validFrom: string
  validTo: string | null
  baseCopperIndexPerKg: number
  copperCreditBelowBase: boolean
  tierDiscountBp: TierDiscounts
  entryCount: number
  accountCount: number
  version: number
  updatedAt: string
}

export const priceListEntriesQuerySchema = pageQuerySchema
export type PriceListEntriesQuery = z.infer<typeof priceListEntriesQuerySchema>

export interface QuantityBreakDto {
  minQuantity: number
  unitPrice: number
}

export interface AdminPriceListEntryRow {
  id: string
  variantId: string
  partNumber: string
  variantName: string
  unitPrice: number
  breaks: QuantityBreakDto[]
  moq: number
  leadTimeDays: number
}

const tierDiscountSchema = z.strictObject({ oem: basisPointsSchema, distributor: basisPointsSchema })

export const priceListHeaderBodySchema = z.strictObject({
  name: z.string({ error: 'enter a name' }).trim().min(2, { error: 'at least 2 characters' }).max(120, { error: 'at most 120 characters' }),
  validFrom: isoDate,
  validTo: isoDate.nullable(),
  baseCopperIndexPerKg: nonNegativeMinorUnitsSchema,
  copperCreditBelowBase: z.boolean(),
  tierDiscountBp: tierDiscountSchema,
  version,
})
export type PriceListHeaderBody = z.infer<typeof priceListHeaderBodySchema>

const quantityBreakSchema = z.strictObject({
  minQuantity: z.number().int({ error: 'whole pieces' }).min(2, { error: 'a break starts above 1 piece' }).max(10_000_000),
  unitPrice: nonNegativeMinorUnitsSchema,
})

export const priceListEntryBodySchema = z.strictObject({
  unitPrice: nonNegativeMinorUnitsSchema,
  breaks: z.array(quantityBreakSchema).max(10, { error: 'at most 10 breaks' }),
  moq: z.number().int({ error: 'whole pieces' }).min(1, { error: 'at least 1' }).max(10_000_000),
  leadTimeDays: z.number().int({ error: 'whole days' }).min(0).max(730, { error: 'at most 730 days' }),
  /** The price list's version the editor loaded: an entry edit locks the whole list. */
  version,
})
export type PriceListEntryBody = z.infer<typeof priceListEntryBodySchema>

export interface PriceListEntryUpdated {
  entry: AdminPriceListEntryRow
  /** The list's new version, to send with the next edit. */
  version: number
}

export const copyPriceListBodySchema = z.strictObject({
  code: z
    .string({ error: 'enter a code' })
    .trim()
    .regex(/^[A-Z0-9][A-Z0-9-]{1,38}[A-Z0-9]$/, { error: '3 to 40 capitals, digits and -' }),
  name: z.string({ error: 'enter a name' }).trim().min(2, { error: 'at least 2 characters' }).max(120, { error: 'at most 120 characters' }),
  validFrom: isoDate,
  validTo: isoDate.nullable(),
})
export type CopyPriceListBody = z.infer<typeof copyPriceListBodySchema>

export const copperIndexQuerySchema = z.object({ currency: currencyCodeSchema.default('USD') })

export const copperIndexBodySchema = z.strictObject({
  currency: currencyCodeSchema,
  /** Minor units per kg. */
  valuePerKg: nonNegativeMinorUnitsSchema.refine((value) => value > 0, { error: 'must be above zero' }),
  effectiveFrom: isoDate,
})
export type CopperIndexBody = z.infer<typeof copperIndexBodySchema>

export interface CopperIndexValue {
  id: string
  currency: string
  valuePerKg: number
  effectiveFrom: string
  createdBy: string | null
  createdAt: string
}

export interface CopperIndexHistory {
  currency: string
  /** The value in force today, if any. */
  current: CopperIndexValue | null
  /** Newest effective date first; future values included. */
  history: CopperIndexValue[]
}

// ---------------------------------------------------------------------------------------------
// Audit log

export const auditQuerySchema = z
  .object({
    page: pageQuerySchema.shape.page,
    pageSize: pageQuerySchema.shape.pageSize,
    entity: z.string().trim().max(40).optional(),
    entityId: z.string().trim().max(64).optional(),
    action: z.string().trim().max(40).optional(),
    /** Part of the actor's e-mail. */
    actor: z.string().trim().max(254).optional(),
    /** First day included, YYYY-MM-DD (UTC). */
    from: isoDate.optional(),
    /** Last day included, YYYY-MM-DD (UTC). */
    to: isoDate.optional(),
  })
  .refine((query) => !query.from || !query.to || query.from <= query.to, { path: ['to'], error: 'the end is before the start' })
export type AuditQuery = z.infer<typeof auditQuerySchema>

export interface AuditRow {
  id: string
  at: string
  actorId: string | null
  actorEmail: string | null
  entity: string
  entityId: string
  action: string
  detail: Record<string, unknown> | null
}

/** The entity and action names present in the log, for the filter menus. */
export interface AuditFacets {
  entities: string[]
  actions: string[]
}
