// Duty studies: a buyer's fan + system + supply + constraints, and the solved, ranked candidates.
// SI inside (m3/s, Pa, W, N m, kg/m3, degC, m); the SPA converts at the edges.
import { z } from 'zod'
import {
  enclosureSchema,
  insulationClassSchema,
  lifecycleSchema,
  mountingSchema,
  motorTypeSchema,
  protectionSchema,
  rotationSchema,
  viewEndSchema,
  type InsulationClassCode,
  type Lifecycle,
  type MotorType,
} from './catalogue.contract'

const num = (label: string) => z.number({ error: `${label} must be a number` }).finite({ error: `${label} must be a finite number` })
const positive = (label: string) => num(label).positive({ error: `${label} must be above 0` })

export const fanPointSchema = z.strictObject({
  flowM3s: num('flow').min(0, { error: 'flow cannot be negative' }),
  staticPa: num('static pressure').min(0, { error: 'static pressure cannot be negative' }),
  shaftW: num('shaft power').min(0, { error: 'shaft power cannot be negative' }),
})

/** A measured fan curve at a reference speed and air density. */
export const fanCurveInputSchema = z.strictObject({
  source: z.literal('curve'),
  refRpm: positive('reference speed').max(4000),
  refDensity: positive('reference density').max(2).default(1.2),
  points: z
    .array(fanPointSchema)
    .min(3, { error: 'give at least 3 points of the fan curve' })
    .max(100)
    .superRefine((points, ctx) => {
      for (let index = 1; index < points.length; index += 1) {
        const previous = points[index - 1]
        const current = points[index]
        if (previous && current && !(current.flowM3s > previous.flowM3s)) {
          ctx.addIssue({ code: 'custom', path: [index, 'flowM3s'], message: 'flows must rise from point to point' })
        }
      }
    }),
  /** The demo fan it came from, if any (informational). */
  demoFanCode: z.string().max(40).optional(),
})

/**
 * Only the duty point is known: Spinwright builds a generic fan curve through it at the stated
 * speed, with shaft power from the estimated fan efficiency (see docs/engineering.md).
 */
export const fanDutyOnlySchema = z.strictObject({
  source: z.literal('duty-only'),
  rpmAtDuty: positive('fan speed at the duty').max(4000),
  efficiency: num('fan efficiency').min(0.05, { error: 'fan efficiency must be at least 5 %' }).max(0.9, { error: 'fan efficiency above 90 % is not credible' }),
})

export const fanInputSchema = z.discriminatedUnion('source', [fanCurveInputSchema, fanDutyOnlySchema], {
  error: 'fan.source must be "curve" or "duty-only"',
})

export const studyInputSchema = z.strictObject({
  name: z.string().trim().min(1, { error: 'give the study a name' }).max(120),
  fan: fanInputSchema,
  duty: z.strictObject({
    flowM3s: positive('duty flow').max(5),
    staticPa: positive('duty static pressure').max(5000),
  }),
  /** The system curve runs through the duty point: p = offsetPa + k Q^2. */
  system: z.strictObject({
    offsetPa: num('system offset').min(0, { error: 'the offset cannot be negative' }).default(0),
  }),
  supply: z.strictObject({
    volts: positive('supply volts').max(700),
    hz: z.union([z.literal(50), z.literal(60)], { error: 'supply frequency must be 50 or 60 Hz' }),
  }),
  ambient: z.strictObject({
    temperatureC: num('ambient temperature').min(-40).max(120).default(25),
    altitudeM: num('altitude').min(-400).max(5000).default(0),
    /** Overrides the density computed from temperature and altitude. */
    densityKgM3: positive('air density').max(2).optional(),
  }),
  energy: z.strictObject({
    hoursPerYear: num('hours per year').min(0).max(8784).default(2000),
    /** Tariff in minor currency units per kWh (e.g. 16.5 US cents); a rate, so it may have decimals. */
    tariffMinorPerKWh: num('tariff').min(0).max(10_000).default(16),
    currency: z.string().regex(/^[A-Z]{3}$/).default('USD'),
    lifeYears: num('product life').min(1).max(30).default(10),
  }),
  constraints: z.strictObject({
    motorTypes: z.array(motorTypeSchema).default([]),
    maxFrameDiameterMm: positive('max frame diameter').max(400).optional(),
    mountings: z.array(mountingSchema).default([]),
    enclosures: z.array(enclosureSchema).default([]),
    /** Required rotation, viewed from the stated end; a variant qualifies if it turns so or offers the other rotation. */
    rotation: z.strictObject({ direction: rotationSchema, viewedFrom: viewEndSchema }).optional(),
    minInsulationClass: insulationClassSchema.optional(),
    protections: z.array(protectionSchema).default([]),
    maxInputW: positive('max input').max(5000).optional(),
    activeOnly: z.boolean().default(true),
  }),
  tolerance: z.strictObject({
    voltagePct: num('voltage tolerance').min(0).max(20).default(10),
    /** Required flow margin at the worst case, in % of the duty flow. */
    minMarginPct: num('margin').min(-50).max(100).default(0),
  }),
})
export type StudyInput = z.infer<typeof studyInputSchema>
export type StudyInputDraft = z.input<typeof studyInputSchema>

export const studyCreateSchema = z.strictObject({ input: studyInputSchema })
export const studyUpdateSchema = z.strictObject({ input: studyInputSchema, version: z.number().int().min(1) })

// ---------------------------------------------------------------- results
export interface PointSummary {
  status: 'running' | 'no-start'
  rpm: number
  flowM3s: number
  staticPa: number
  inputW: number | null
  currentA: number | null
  powerFactor: number | null
  efficiency: number | null
  outputW: number
  shaftTorqueNm: number
  crawl: boolean
  fanStall: boolean
}

export const WARNING_CODES = [
  'no-start',
  'crawl',
  'near-breakdown',
  'fan-stall',
  'ambient-above-rating',
  'insulation-below-requirement',
  'discontinued',
  'not-for-new-designs',
  'low-line-short',
  'input-above-limit',
  'extrapolated',
] as const
export type WarningCode = (typeof WARNING_CODES)[number]

export interface CandidateWarning {
  code: WarningCode
  message: string
}

export interface Candidate {
  rank: number
  variantId: string
  partNumber: string
  name: string
  type: MotorType
  poles: number
  tap: string
  frameDiameterMm: number
  insulationClass: InsulationClassCode
  lifecycle: Lifecycle
  ratedOutputW: number
  nominal: PointSummary
  lowLine: PointSummary
  hot: PointSummary | null
  /** Worst-case flow reaches the duty flow plus the required margin. */
  meetsDuty: boolean
  /** Flow at nominal supply against the duty flow, in %. */
  marginPct: number
  lowLineMarginPct: number
  /** Breakdown torque over load torque at the nominal point, minus 1, in %. */
  breakdownMarginPct: number | null
  energyPerYearKWh: number
  energyPerYearMinor: number
  lifeEnergyMinor: number
  warnings: CandidateWarning[]
  /** The ranking key as a number, higher is better (documented in docs/selection.md). */
  score: number
}

export interface CurveSample {
  rpm: number
  torqueNm: number
}

export interface CandidateCurves {
  variantId: string
  partNumber: string
  tap: string
  /** Shaft torque against speed at nominal supply. */
  motorNominal: CurveSample[]
  motorLowLine: CurveSample[]
}

export interface RunResult {
  ranAt: string
  durationMs: number
  /** Catalogue revision the run saw; a later re-run compares against it. */
  catalogueRevision: number
  densityKgM3: number
  systemK: number
  considered: number
  excluded: { reason: string; count: number }[]
  /** The best candidates, at most CANDIDATE_LIMIT of them; `candidateTotal` counts them all. */
  candidates: Candidate[]
  candidateTotal: number
  /** Torque-speed curves of the best candidates for the charts. */
  curves: CandidateCurves[]
  /** Load torque against speed (the fan on its system at the operating density). */
  loadCurve: CurveSample[]
}

export interface RunChanges {
  previousRunId: string
  catalogueChanged: boolean
  added: string[]
  removed: string[]
  moved: { partNumber: string; fromRank: number; toRank: number }[]
  flowChanged: { partNumber: string; fromM3s: number; toM3s: number }[]
}

export interface StudyRunRecord {
  id: string
  studyId: string
  result: RunResult
  changes: RunChanges | null
}

export interface StudySummary {
  id: string
  name: string
  ownerName: string
  organisationName: string
  updatedAt: string
  lastRunAt: string | null
  candidateCount: number | null
  shared: boolean
}

export interface StudyRecord extends StudySummary {
  version: number
  input: StudyInput
  shareToken: string | null
  runs: { id: string; ranAt: string; candidateCount: number }[]
  /** True when the reader may edit (own organisation, not through a share link). */
  editable: boolean
}
