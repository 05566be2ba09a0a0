// Catalogue contracts: motor families, variants and their performance data. Shared by the API,
// the SPA, the demo seed and the CSV import. SI units; speeds in r/min; masses in grams.
import { z } from 'zod'
import { pageQuerySchema } from './admin.contract'

export const MOTOR_TYPES = ['shaded-pole', 'psc'] as const
export const motorTypeSchema = z.enum(MOTOR_TYPES)
export type MotorType = z.infer<typeof motorTypeSchema>

export const LIFECYCLES = ['active', 'not-for-new-designs', 'discontinued'] as const
export const lifecycleSchema = z.enum(LIFECYCLES)
export type Lifecycle = z.infer<typeof lifecycleSchema>

/** IEC 60085 thermal classes used on small motors, coolest first. */
export const INSULATION_CLASS_CODES = ['A', 'E', 'B', 'F', 'H'] as const
export const insulationClassSchema = z.enum(INSULATION_CLASS_CODES)
export type InsulationClassCode = z.infer<typeof insulationClassSchema>

export const PROTECTIONS = ['impedance', 'auto-reset', 'manual-reset', 'none'] as const
export const protectionSchema = z.enum(PROTECTIONS)
export type Protection = z.infer<typeof protectionSchema>

export const MOUNTINGS = ['stud', 'through-bolt', 'flange', 'bracket', 'resilient-ring', 'belly-band'] as const
export const mountingSchema = z.enum(MOUNTINGS)
export type Mounting = z.infer<typeof mountingSchema>

export const ENCLOSURES = ['open', 'air-over', 'totally-enclosed'] as const
export const enclosureSchema = z.enum(ENCLOSURES)
export type Enclosure = z.infer<typeof enclosureSchema>

export const ROTATIONS = ['cw', 'ccw'] as const
export const rotationSchema = z.enum(ROTATIONS)
export type RotationCode = z.infer<typeof rotationSchema>

export const VIEW_ENDS = ['shaft-end', 'lead-end'] as const
export const viewEndSchema = z.enum(VIEW_ENDS)

export const PERFORMANCE_SOURCES = ['measured', 'datasheet', 'fitted'] as const
export const performanceSourceSchema = z.enum(PERFORMANCE_SOURCES)

const positive = (label: string) => z.number({ error: `${label} must be a number` }).finite().positive({ error: `${label} must be above 0` })
const nonNegative = (label: string) => z.number({ error: `${label} must be a number` }).finite().min(0, { error: `${label} cannot be negative` })

/** The writable description of a motor family. */
export const familySpecSchema = z.strictObject({
  code: z.string().trim().regex(/^[A-Z0-9][A-Z0-9-]{1,23}$/, { error: 'upper-case letters, digits and -, 2 to 24 characters' }),
  name: z.string().trim().min(2).max(120),
  type: motorTypeSchema,
  description: z.string().trim().max(2000).default(''),
  lifecycle: lifecycleSchema.default('active'),
})
export type FamilySpec = z.infer<typeof familySpecSchema>

/** The writable description of one variant (one part number). */
export const variantSpecSchema = z.strictObject({
  partNumber: z.string().trim().regex(/^[A-Z0-9][A-Z0-9-]{2,39}$/, { error: 'upper-case letters, digits and -, 3 to 40 characters' }),
  familyCode: familySpecSchema.shape.code,
  name: z.string().trim().min(2).max(160),
  poles: z.number().int().refine((value) => [2, 4, 6, 8].includes(value), { error: 'poles must be 2, 4, 6 or 8' }),
  ratedVolts: positive('rated volts').max(700),
  ratedHz: z.union([z.literal(50), z.literal(60)], { error: 'rated Hz must be 50 or 60' }),
  /** Also rated on the other of 50/60 Hz at the same volts (with its own performance rows). */
  dualFrequency: z.boolean().default(false),
  ratedOutputW: positive('rated output').max(2000),
  ratedRpm: positive('rated speed').max(3600),
  ratedCurrentA: positive('rated current').max(50),
  ratedInputW: positive('rated input').max(5000),
  lockedRotorTorqueNm: positive('locked-rotor torque').max(50),
  breakdownTorqueNm: positive('breakdown torque').max(50),
  frameDiameterMm: positive('frame diameter').max(400),
  stackLengthMm: positive('stack length').max(300),
  shaftDiameterMm: positive('shaft diameter').max(40),
  shaftLengthMm: positive('shaft length').max(200),
  mounting: mountingSchema,
  rotation: rotationSchema,
  rotationViewedFrom: viewEndSchema,
  otherRotationAvailable: z.boolean(),
  enclosure: enclosureSchema,
  insulationClass: insulationClassSchema,
  protection: protectionSchema,
  maxAmbientC: z.number().finite().min(-40).max(180),
  capacitorUf: positive('capacitor').max(100).nullable().default(null),
  capacitorVac: positive('capacitor voltage').max(800).nullable().default(null),
  copperMassG: nonNegative('copper mass').max(20_000),
  weightG: positive('weight').max(50_000),
  moq: z.number().int().min(1).default(100),
  leadTimeDays: z.number().int().min(1).max(365).default(42),
  lifecycle: lifecycleSchema.default('active'),
  speedTaps: z.array(z.string().trim().min(1).max(20)).min(1).max(6),
})
export type VariantSpec = z.infer<typeof variantSpecSchema>

const curvePointSchema = z.strictObject({
  rpm: nonNegative('rpm'),
  torqueNm: z.number().finite(),
  currentA: nonNegative('current').optional(),
  inputW: nonNegative('input power').optional(),
})

export const curveMotorSchema = z.strictObject({
  model: z.literal('curve'),
  poles: z.number().int().positive(),
  ratedVolts: positive('rated volts'),
  ratedHz: positive('rated Hz'),
  points: z.array(curvePointSchema).min(4, { error: 'at least 4 points' }).max(200),
})

export const circuitMotorSchema = z.strictObject({
  model: z.literal('circuit'),
  poles: z.number().int().positive(),
  ratedHz: positive('rated Hz'),
  r1: positive('r1'),
  x1: positive('x1'),
  r2: positive('r2'),
  x2: positive('x2'),
  xm: positive('xm'),
  coreLossW: nonNegative('core loss').optional(),
  frictionW: nonNegative('friction').optional(),
  aux: z
    .strictObject({ r: positive('aux r'), x: positive('aux x'), turnsRatio: positive('turns ratio'), capacitorUf: positive('capacitor') })
    .optional(),
})

export const motorModelSchema = z.discriminatedUnion('model', [curveMotorSchema, circuitMotorSchema])

/** Performance data of one variant at one speed tap and one supply. */
export const performanceSpecSchema = z.strictObject({
  partNumber: variantSpecSchema.shape.partNumber,
  tap: z.string().trim().min(1).max(20),
  volts: positive('volts'),
  hz: positive('Hz'),
  source: performanceSourceSchema,
  /** Reference winding temperature of the circuit resistances, for the hot-winding case. */
  referenceTempC: z.number().finite().min(-40).max(200).default(25),
  motor: motorModelSchema,
})
export type PerformanceSpec = z.infer<typeof performanceSpecSchema>

// ---------------------------------------------------------------- catalogue list
export const VARIANT_SORT_KEYS = ['partNumber', 'name', 'type', 'poles', 'ratedVolts', 'ratedOutputW', 'ratedRpm', 'frameDiameterMm', 'ratedInputW', 'lifecycle'] as const

const csvList = <T extends z.ZodType>(item: T) =>
  z.preprocess((value) => (typeof value === 'string' ? value.split(',').filter(Boolean) : value), z.array(item)).optional()

export const variantListQuerySchema = pageQuerySchema.extend({
  type: csvList(motorTypeSchema),
  poles: csvList(z.coerce.number().int()),
  /** Supplies as "120-60" (volts-hz). */
  supply: csvList(z.string().regex(/^\d{2,3}-(50|60)$/, { error: 'supply as volts-hz, e.g. 120-60' })),
  minOutputW: z.coerce.number().finite().min(0).optional(),
  maxOutputW: z.coerce.number().finite().min(0).optional(),
  maxFrameMm: z.coerce.number().finite().positive().optional(),
  protection: csvList(protectionSchema),
  insulation: csvList(insulationClassSchema),
  lifecycle: csvList(lifecycleSchema),
  sort: z.enum(VARIANT_SORT_KEYS).default('partNumber'),
  order: z.enum(['asc', 'desc']).default('asc'),
})
export type VariantListQuery = z.infer<typeof variantListQuerySchema>

export interface VariantRow {
  id: string
  partNumber: string
  name: string
  familyCode: string
  familyName: string
  type: MotorType
  poles: number
  ratedVolts: number
  ratedHz: number
  dualFrequency: boolean
  ratedOutputW: number
  ratedRpm: number
  ratedInputW: number
  ratedCurrentA: number
  frameDiameterMm: number
  insulationClass: InsulationClassCode
  protection: Protection
  lifecycle: Lifecycle
  speedTaps: string[]
}

export interface PerformanceRecord {
  id: string
  tap: string
  volts: number
  hz: number
  source: z.infer<typeof performanceSourceSchema>
  referenceTempC: number
  motor: z.infer<typeof motorModelSchema>
  createdAt: string
}

export interface DatasheetRecord {
  id: string
  originalName: string
  sizeBytes: number
  uploadedAt: string
}

export interface VariantDetail extends VariantRow, Omit<VariantSpec, 'familyCode' | 'lifecycle' | 'speedTaps' | keyof VariantRow> {
  familyDescription: string
  performance: PerformanceRecord[]
  datasheets: DatasheetRecord[]
  updatedAt: string
}

export interface CatalogueFacets {
  supplies: { volts: number; hz: number; count: number }[]
  frames: number[]
  outputRangeW: { min: number; max: number }
}

// ---------------------------------------------------------------- demo fans
export interface DemoFan {
  id: string
  code: string
  name: string
  application: string
  refRpm: number
  refDensity: number
  points: { flowM3s: number; staticPa: number; shaftW: number }[]
  /** A typical duty on the fan's own curve, offered as a starting point. */
  suggestedDuty: { flowM3s: number; staticPa: number }
}
