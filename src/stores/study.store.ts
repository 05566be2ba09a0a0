// The duty study being edited: the draft (SI inside, the fields convert for display), its
// validation by the shared contract and the engineering core, the live preview, runs, saving and
// sharing. One study at a time; the view resets it when the route changes study.
import { computed, reactive, ref, shallowRef, watch } from 'vue'
import { defineStore } from 'pinia'
import { studyInputSchema, type RunChanges, type RunResult, type StudyInput, type StudyRecord, type StudyRunRecord } from '@shared/contracts/study.contract'
import type { DemoFan, InsulationClassCode, Mounting, Enclosure, MotorType, Protection, RotationCode } from '@shared/contracts/catalogue.contract'
import { EngineeringInputError, Pchip, prepareLoad, syncRpm, type FanPoint, type PreparedLoad } from '@shared/engineering'
import * as studiesApi from '@/api/studies.api'
import { listDemoFans } from '@/api/catalogue.api'
import { toApiFailure, type ApiFailure } from '@/api/http'
import { useSessionStore } from './session.store'
import { airDensity, studyFanCurve } from '@shared/selection/air'

export type FanMode = 'demo' | 'points' | 'duty-only'
export type SupplyPreset = '120-60' | '230-50' | '230-60' | '100-50' | '100-60' | 'custom'
export const SUPPLY_PRESETS: { key: SupplyPreset; title: string; volts?: number; hz?: 50 | 60 }[] = [
  { key: '120-60', title: '120 V 60 Hz', volts: 120, hz: 60 },
  { key: '230-50', title: '230 V 50 Hz', volts: 230, hz: 50 },
  { key: '230-60', title: '230 V 60 Hz', volts: 230, hz: 60 },
  { key: '100-50', title: '100 V 50 Hz', volts: 100, hz: 50 },
  { key: '100-60', title: '100 V 60 Hz', volts: 100, hz: 60 },
  { key: 'custom', title: 'Other voltage' },
]

export interface FanPointDraft {
  flowM3s: number | null
  staticPa: number | null
  shaftW: number | null
}

export interface StudyDraft {
  name: string
  fanMode: FanMode
  demoFanCode: string | null
  refRpm: number | null
  refDensity: number | null
  points: FanPointDraft[]
  rpmAtDuty: number | null
  efficiencyPct: number | null
  dutyFlowM3s: number | null
  dutyStaticPa: number | null
  offsetPa: number | null
  supplyPreset: SupplyPreset
  volts: number | null
  hz: 50 | 60
  temperatureC: number | null
  altitudeM: number | null
  densityOverride: boolean
  densityKgM3: number | null
  hoursPerYear: number | null
  tariffMinorPerKWh: number | null
  currency: string
  lifeYears: number | null
  motorTypes: MotorType[]
  maxFrameDiameterMm: number | null
  mountings: Mounting[]
  enclosures: Enclosure[]
  rotation: RotationCode | 'any'
  viewedFrom: 'shaft-end' | 'lead-end'
  minInsulationClass: InsulationClassCode | null
  protections: Protection[]
  maxInputW: number | null
  activeOnly: boolean
  voltagePct: number | null
  minMarginPct: number | null
}

export function blankDraft(): StudyDraft {
  return {
    name: 'New duty study',
    fanMode: 'demo',
    demoFanCode: null,
    refRpm: null,
    refDensity: 1.2,
    points: [emptyPoint(), emptyPoint(), emptyPoint(), emptyPoint()],
    rpmAtDuty: null,
    efficiencyPct: 30,
    dutyFlowM3s: null,
    dutyStaticPa: null,
    offsetPa: 0,
    supplyPreset: '120-60',
    volts: 120,
    hz: 60,
    temperatureC: 25,
    altitudeM: 0,
    densityOverride: false,
    densityKgM3: null,
    hoursPerYear: 2000,
    tariffMinorPerKWh: 16,
    currency: 'USD',
    lifeYears: 10,
    motorTypes: [],
    maxFrameDiameterMm: null,
    mountings: [],
    enclosures: [],
    rotation: 'any',
    viewedFrom: 'shaft-end',
    minInsulationClass: null,
    protections: [],
    maxInputW: null,
    activeOnly: true,
    voltagePct: 10,
    minMarginPct: 0,
  }
}

export function emptyPoint(): FanPointDraft {
  return { flowM3s: null, staticPa: null, shaftW: null }
}

/** A valid input to complete partial drafts for the core's helpers (only fan and duty matter there). */
const BASE_INPUT: StudyInput = {
  name: 'preview',
  fan: { source: 'duty-only', rpmAtDuty: 1000, efficiency: 0.3 },
  duty: { flowM3s: 0.1, staticPa: 100 },
  system: { offsetPa: 0 },
  supply: { volts: 120, hz: 60 },
  ambient: { temperatureC: 25, altitudeM: 0 },
  energy: { hoursPerYear: 2000, tariffMinorPerKWh: 16, currency: 'USD', lifeYears: 10 },
  constraints: { motorTypes: [], mountings: [], enclosures: [], protections: [], activeOnly: true },
  tolerance: { voltagePct: 10, minMarginPct: 0 },
}

/**
 * Pressure-flow samples of a fan curve moved by the fan laws to `rpm` and density ratio `d`
 * (Q ~ n, p ~ n^2 rho), interpolated by PCHIP like the core does, SI.
 */
export function sampleFanCurve(points: readonly FanPoint[], refRpm: number, rpm: number, d: number, samples = 60): [number, number][] {
  if (points.length < 2 || !(refRpm > 0)) return []
  const sorted = [...points].sort((a, b) => a.flowM3s - b.flowM3s)
  const xs = sorted.map((p) => p.flowM3s)
  if (xs.some((x, i) => i > 0 && !(x > (xs[i - 1] ?? -Infinity)))) return sorted.map((p) => [p.flowM3s * (rpm / refRpm), p.staticPa * (rpm / refRpm) ** 2 * d])
  const curve = new Pchip(xs, sorted.map((p) => p.staticPa))
  const first = xs[0] ?? 0
  const last = xs[xs.length - 1] ?? 0
  const r = rpm / refRpm
  const out: [number, number][] = []
  for (let i = 0; i <= samples; i += 1) {
    const q = first + ((last - first) * i) / samples
    out.push([q * r, curve.value(q) * r * r * d])
  }
  return out
}

/** "load.fan.points[2].flowM3s" of the core to the form's "fan.points.2.flowM3s". */
function coreFieldToForm(field: string): string {
  const path = field.replace(/^load\./, '').replace(/\[(\d+)\]/g, '.$1')
  if (path === 'system.k') return 'duty.staticPa'
  if (path === 'density') return 'ambient.densityKgM3'
  return path
}

function isBlank(p: FanPointDraft): boolean {
  return p.flowM3s === null && p.staticPa === null && p.shaftW === null
}

/** The rows that count: all but blank rows at the end (at least three, so "required" shows). */
export function usedPoints(points: FanPointDraft[]): FanPointDraft[] {
  let end = points.length
  while (end > 3 && points[end - 1] && isBlank(points[end - 1] ?? emptyPoint())) end -= 1
  return points.slice(0, end)
}

export function candidateKey(candidate: { partNumber: string; tap: string }): string {
  return `${candidate.partNumber}|${candidate.tap}`
}

export interface PreviewCurves {
  /** The fan curve as entered (reference speed and density), SI. */
  fan: FanPoint[]
  refRpm: number
  refDensity: number
  density: number
  k: number
  offsetPa: number
  duty: { flowM3s: number; staticPa: number } | null
  /** Speed at which the fan meets the system at the duty flow, by the fan laws. */
  rpmForDuty: number | null
  generic: boolean
  prepared: PreparedLoad | null
}

export const useStudyStore = defineStore('study', () => {
  const session = useSessionStore()

  const draft = reactive<StudyDraft>(blankDraft())
  const record = shallowRef<StudyRecord | null>(null)
  const readOnly = ref(false)
  const run = shallowRef<StudyRunRecord | null>(null)
  /** A run that was not saved (anonymous or preview). */
  const previewResult = shallowRef<RunResult | null>(null)
  const demoFans = shallowRef<DemoFan[]>([])
  const demoFansFailure = ref<string | null>(null)
  const serverFields = ref<Record<string, string>>({})
  const failure = ref<ApiFailure | null>(null)
  const conflict = ref(false)
  const attempted = ref(false)
  const busy = ref<'run' | 'save' | 'load' | 'share' | null>(null)
  const savedInputJson = ref<string | null>(null)
  const selected = ref<string[]>([])
  /** Part number the study was started from (catalogue "use in a duty study"). */
  const fromVariant = ref<string | null>(null)

  // ---------------------------------------------------------------- validation
  const density = computed(() => {
    if (draft.densityOverride && draft.densityKgM3 !== null && draft.densityKgM3 > 0) return draft.densityKgM3
    return airDensity(draft.temperatureC ?? 25, draft.altitudeM ?? 0)
  })

  /** The draft as the contract wants it, plus which required fields are still empty. */
  const candidateInput = computed(() => {
    const missing = new Set<string>()
    const req = (value: number | null, path: string): number | undefined => {
      if (value === null) missing.add(path)
      return value ?? undefined
    }
    const opt = (value: number | null): number | undefined => value ?? undefined
    const fan =
      draft.fanMode === 'duty-only'
        ? { source: 'duty-only' as const, rpmAtDuty: req(draft.rpmAtDuty, 'fan.rpmAtDuty'), efficiency: draft.efficiencyPct === null ? (missing.add('fan.efficiency'), undefined) : draft.efficiencyPct / 100 }
        : {
            source: 'curve' as const,
            refRpm: req(draft.refRpm, 'fan.refRpm'),
            refDensity: req(draft.refDensity, 'fan.refDensity'),
            points: usedPoints(draft.points).map((p, index) => ({
                flowM3s: req(p.flowM3s, `fan.points.${index}.flowM3s`),
                staticPa: req(p.staticPa, `fan.points.${index}.staticPa`),
                shaftW: req(p.shaftW, `fan.points.${index}.shaftW`),
              })),
            ...(draft.fanMode === 'demo' && draft.demoFanCode ? { demoFanCode: draft.demoFanCode } : {}),
          }
    const raw = {
      name: draft.name,
      fan,
      duty: { flowM3s: req(draft.dutyFlowM3s, 'duty.flowM3s'), staticPa: req(draft.dutyStaticPa, 'duty.staticPa') },
      system: { offsetPa: draft.offsetPa ?? 0 },
      supply: { volts: req(draft.volts, 'supply.volts'), hz: draft.hz },
      ambient: {
        temperatureC: opt(draft.temperatureC),
        altitudeM: opt(draft.altitudeM),
        ...(draft.densityOverride ? { densityKgM3: req(draft.densityKgM3, 'ambient.densityKgM3') } : {}),
      },
      energy: { hoursPerYear: opt(draft.hoursPerYear), tariffMinorPerKWh: opt(draft.tariffMinorPerKWh), currency: draft.currency, lifeYears: opt(draft.lifeYears) },
      constraints: {
        motorTypes: draft.motorTypes,
        maxFrameDiameterMm: opt(draft.maxFrameDiameterMm),
        mountings: draft.mountings,
        enclosures: draft.enclosures,
        ...(draft.rotation !== 'any' ? { rotation: { direction: draft.rotation, viewedFrom: draft.viewedFrom } } : {}),
        ...(draft.minInsulationClass ? { minInsulationClass: draft.minInsulationClass } : {}),
        protections: draft.protections,
        maxInputW: opt(draft.maxInputW),
        activeOnly: draft.activeOnly,
      },
      tolerance: { voltagePct: opt(draft.voltagePct), minMarginPct: opt(draft.minMarginPct) },
    }
    return { raw, missing }
  })

  const parsed = computed(() => studyInputSchema.safeParse(candidateInput.value.raw))
  const input = computed<StudyInput | null>(() => (parsed.value.success ? parsed.value.data : null))

  const contractErrors = computed<Record<string, string>>(() => {
    const errors: Record<string, string> = {}
    if (parsed.value.success) return errors
    for (const issue of parsed.value.error.issues) {
      const path = issue.path.map(String).join('.')
      if (errors[path]) continue
      errors[path] = candidateInput.value.missing.has(path) ? 'required' : issue.message
    }
    return errors
  })

  // ---------------------------------------------------------------- live preview (engineering core)
  const previewState = computed<{ curves: PreviewCurves | null; errors: Record<string, string>; notes: Record<string, string> }>(() => {
    const errors: Record<string, string> = {}
    const notes: Record<string, string> = {}
    const rho = density.value
    const dutyFlow = draft.dutyFlowM3s
    const dutyPa = draft.dutyStaticPa
    const duty = dutyFlow !== null && dutyPa !== null && dutyFlow > 0 && dutyPa > 0 ? { flowM3s: dutyFlow, staticPa: dutyPa } : null
    const offsetPa = draft.offsetPa ?? 0
    let fan: FanPoint[] = []
    let refRpm = 0
    let refDensity = 1.2
    let generic = false
    const rowOf: number[] = []
    if (draft.fanMode === 'duty-only') {
      const eff = (draft.efficiencyPct ?? 0) / 100
      if (duty && eff >= 0.05 && eff <= 0.9 && draft.rpmAtDuty !== null && draft.rpmAtDuty > 0) {
        // The same generic curve the server's selection builds.
        const curve = studyFanCurve({ ...BASE_INPUT, fan: { source: 'duty-only', rpmAtDuty: draft.rpmAtDuty, efficiency: eff }, duty }, rho)
        fan = curve.points
        refRpm = curve.refRpm
        refDensity = curve.refDensity
        generic = true
      }
    } else {
      // Preview what is complete; rows keep their own numbers for the error paths.
      draft.points.forEach((p, index) => {
        if (p.flowM3s !== null && p.staticPa !== null && p.shaftW !== null) {
          rowOf.push(index)
          fan.push({ flowM3s: p.flowM3s, staticPa: p.staticPa, shaftW: p.shaftW })
        }
      })
      refRpm = draft.refRpm ?? 0
      refDensity = draft.refDensity ?? 1.2
    }
    if (fan.length < 2 || !(refRpm > 0) || !(refDensity > 0)) {
      return { curves: fan.length >= 2 ? { fan, refRpm, refDensity, density: rho, k: 0, offsetPa, duty, rpmForDuty: null, generic, prepared: null } : null, errors, notes }
    }
    let k = 0
    let prepared: PreparedLoad | null = null
    let rpmForDuty: number | null = null
    if (duty) {
      if (offsetPa >= duty.staticPa) {
        errors['system.offsetPa'] = 'the offset must stay below the duty static pressure (the system curve runs through the duty point)'
      } else {
        k = (duty.staticPa - offsetPa) / (duty.flowM3s * duty.flowM3s)
        try {
          prepared = prepareLoad({ kind: 'fan', fan: { refRpm, refDensity, points: fan }, system: { k, offsetPa }, density: rho })
        } catch (error) {
          if (error instanceof EngineeringInputError) {
            const field = coreFieldToForm(error.field).replace(/^fan\.points\.(\d+)/, (whole, n: string) => (generic ? 'duty.staticPa' : `fan.points.${rowOf[Number(n)] ?? n}`))
            errors[field] = error.message.replace(/^[^:]*: /, '')
          }
          else throw error
        }
      }
    }
    if (prepared && duty) {
      // Flow rises with speed along the system curve: bisect for the speed that gives the duty flow.
      const ceiling = Math.min(prepared.maxRpm, 4 * refRpm)
      const flowAt = (rpm: number): number => prepared?.evaluate(rpm).flowM3s ?? 0
      if (flowAt(ceiling) >= duty.flowM3s) {
        let lo = 0
        let hi = ceiling
        for (let i = 0; i < 60; i += 1) {
          const mid = 0.5 * (lo + hi)
          if (flowAt(mid) < duty.flowM3s) lo = mid
          else hi = mid
        }
        rpmForDuty = hi
      }
      const fastest = syncRpm(2, draft.hz)
      if (rpmForDuty === null || rpmForDuty >= fastest) {
        errors['duty.staticPa'] =
          `the duty lies above what this fan can give on the system curve even at ${fastest.toFixed(0)} r/min (2-pole synchronous speed at ${draft.hz} Hz): lower the duty or choose a larger fan`
      } else {
        const evaluation = prepared.evaluate(rpmForDuty)
        if (evaluation.fanStall) notes['duty.staticPa'] = 'the duty lies left of the fan\'s pressure peak (stall region): expect unstable running and noise'
        else if (rpmForDuty > refRpm * 1.005) notes['duty.staticPa'] = `above the fan curve at ${refRpm.toFixed(0)} r/min: the fan needs about ${rpmForDuty.toFixed(0)} r/min for the duty`
      }
    }
    return { curves: { fan, refRpm, refDensity, density: rho, k, offsetPa, duty, rpmForDuty, generic, prepared }, errors, notes }
  })

  const fieldErrors = computed<Record<string, string>>(() => {
    const merged: Record<string, string> = { ...previewState.value.errors, ...contractErrors.value, ...serverFields.value }
    if (!attempted.value) for (const [path, message] of Object.entries(merged)) if (message === 'required') delete merged[path]
    return merged
  })

  const blockingErrors = computed(() => Object.keys({ ...previewState.value.errors, ...contractErrors.value }).length)

  function errorFor(path: string): string | undefined {
    return fieldErrors.value[path]
  }

  function noteFor(path: string): string | undefined {
    return previewState.value.notes[path]
  }

  const dirty = computed(() => savedInputJson.value === null || JSON.stringify(candidateInput.value.raw) !== savedInputJson.value)
  /** Inputs that move the results changed since the last save (the name does not count). */
  const resultsStale = computed(() => {
    if (savedInputJson.value === null) return true
    const saved: unknown = JSON.parse(savedInputJson.value)
    const withoutName = (value: unknown) => JSON.stringify(typeof value === 'object' && value !== null ? { ...value, name: '' } : value)
    return withoutName(saved) !== withoutName(candidateInput.value.raw)
  })
  // Any edit makes the server's field reasons stale.
  watch(
    () => JSON.stringify(candidateInput.value.raw),
    () => {
      if (Object.keys(serverFields.value).length > 0) serverFields.value = {}
    },
  )

  // ---------------------------------------------------------------- results
  const result = computed<RunResult | null>(() => run.value?.result ?? previewResult.value)
  const changes = computed<RunChanges | null>(() => run.value?.changes ?? null)
  const selectedCandidates = computed(() => {
    const candidates = result.value?.candidates ?? []
    return selected.value.map((key) => candidates.find((c) => candidateKey(c) === key)).filter((c) => c !== undefined)
  })

  // ---------------------------------------------------------------- actions
  function applyDraft(next: StudyDraft): void {
    Object.assign(draft, next)
  }

  function reset(): void {
    applyDraft(blankDraft())
    record.value = null
    run.value = null
    previewResult.value = null
    readOnly.value = false
    serverFields.value = {}
    failure.value = null
    conflict.value = false
    attempted.value = false
    savedInputJson.value = null
    selected.value = []
    fromVariant.value = null
  }

  async function loadDemoFans(): Promise<void> {
    if (demoFans.value.length > 0) return
    try {
      demoFans.value = await listDemoFans()
      demoFansFailure.value = null
    } catch (error) {
      demoFansFailure.value = toApiFailure(error).message
    }
  }

  function pickDemoFan(code: string, takeDuty: boolean): void {
    const fan = demoFans.value.find((f) => f.code === code)
    if (!fan) return
    draft.fanMode = 'demo'
    draft.demoFanCode = fan.code
    draft.refRpm = fan.refRpm
    draft.refDensity = fan.refDensity
    draft.points = fan.points.map((p) => ({ ...p }))
    if (takeDuty) {
      draft.dutyFlowM3s = fan.suggestedDuty.flowM3s
      draft.dutyStaticPa = fan.suggestedDuty.staticPa
    }
    if (draft.name === 'New duty study' || draft.name.trim() === '') draft.name = `${fan.name} study`
  }

  function draftFromInput(input: StudyInput): StudyDraft {
    const next = blankDraft()
    next.name = input.name
    if (input.fan.source === 'curve') {
      next.fanMode = input.fan.demoFanCode ? 'demo' : 'points'
      next.demoFanCode = input.fan.demoFanCode ?? null
      next.refRpm = input.fan.refRpm
      next.refDensity = input.fan.refDensity
      next.points = input.fan.points.map((p) => ({ ...p }))
    } else {
      next.fanMode = 'duty-only'
      next.rpmAtDuty = input.fan.rpmAtDuty
      next.efficiencyPct = Math.round(input.fan.efficiency * 1000) / 10
    }
    next.dutyFlowM3s = input.duty.flowM3s
    next.dutyStaticPa = input.duty.staticPa
    next.offsetPa = input.system.offsetPa
    next.volts = input.supply.volts
    next.hz = input.supply.hz
    next.supplyPreset = SUPPLY_PRESETS.find((p) => p.volts === input.supply.volts && p.hz === input.supply.hz)?.key ?? 'custom'
    next.temperatureC = input.ambient.temperatureC
    next.altitudeM = input.ambient.altitudeM
    next.densityOverride = input.ambient.densityKgM3 !== undefined
    next.densityKgM3 = input.ambient.densityKgM3 ?? null
    next.hoursPerYear = input.energy.hoursPerYear
    next.tariffMinorPerKWh = input.energy.tariffMinorPerKWh
    next.currency = input.energy.currency
    next.lifeYears = input.energy.lifeYears
    const c = input.constraints
    next.motorTypes = [...c.motorTypes]
    next.maxFrameDiameterMm = c.maxFrameDiameterMm ?? null
    next.mountings = [...c.mountings]
    next.enclosures = [...c.enclosures]
    next.rotation = c.rotation?.direction ?? 'any'
    next.viewedFrom = c.rotation?.viewedFrom ?? 'shaft-end'
    next.minInsulationClass = c.minInsulationClass ?? null
    next.protections = [...c.protections]
    next.maxInputW = c.maxInputW ?? null
    next.activeOnly = c.activeOnly
    next.voltagePct = input.tolerance.voltagePct
    next.minMarginPct = input.tolerance.minMarginPct
    return next
  }

  function adopt(next: StudyRecord): void {
    record.value = next
    applyDraft(draftFromInput(next.input))
    savedInputJson.value = JSON.stringify(candidateInput.value.raw)
    conflict.value = false
  }

  async function guard<T>(kind: NonNullable<typeof busy.value>, work: () => Promise<T>): Promise<T | undefined> {
    busy.value = kind
    failure.value = null
    try {
      return await work()
    } catch (error) {
      const f = toApiFailure(error)
      if (f.status === 409 && f.code === 'stale_version') conflict.value = true
      const fields: Record<string, string> = {}
      for (const [path, message] of Object.entries(f.fields)) fields[coreFieldToForm(path.replace(/^input\./, ''))] = message
      serverFields.value = fields
      failure.value = f
      return undefined
    } finally {
      busy.value = null
    }
  }

  async function loadStudy(id: string): Promise<void> {
    reset()
    await guard('load', async () => {
      const loaded = await studiesApi.getStudy(id)
      adopt(loaded)
      readOnly.value = !loaded.editable
      const latest = [...loaded.runs].sort((a, b) => a.ranAt.localeCompare(b.ranAt)).pop()
      if (latest) run.value = await studiesApi.getRun(id, latest.id)
      preselect()
    })
  }

  async function loadShared(token: string): Promise<void> {
    reset()
    await guard('load', async () => {
      const shared = await studiesApi.getSharedStudy(token)
      adopt(shared)
      readOnly.value = true
      run.value = shared.latestRun
      preselect()
    })
  }

  /** Saves the draft (create or update); returns the record, or undefined when it failed. */
  async function save(): Promise<StudyRecord | undefined> {
    attempted.value = true
    const valid = input.value
    if (!valid) {
      failure.value = { status: 0, code: 'client', message: 'Some fields need attention before the study can be saved', fields: {} }
      return undefined
    }
    const current = record.value
    if (current && !dirty.value) return current
    return guard('save', async () => {
      const saved = current ? await studiesApi.updateStudy(current.id, valid, current.version) : await studiesApi.createStudy(valid)
      record.value = saved
      savedInputJson.value = JSON.stringify(candidateInput.value.raw)
      return saved
    })
  }

  /** Signed in: save, then run on the server and keep the run. Anonymous: a preview run. */
  async function runNow(): Promise<boolean> {
    attempted.value = true
    const valid = input.value
    if (!valid) {
      failure.value = { status: 0, code: 'client', message: 'Some fields need attention before the study can run', fields: {} }
      return false
    }
    if (!session.signedIn) {
      const answer = await guard('run', () => studiesApi.previewRun(valid))
      if (!answer) return false
      previewResult.value = answer
      run.value = null
      preselect()
      return true
    }
    const saved = await save()
    if (!saved) return false
    const answer = await guard('run', () => studiesApi.runStudy(saved.id))
    if (!answer) return false
    run.value = answer
    previewResult.value = null
    const ranAt = answer.result.ranAt
    record.value = { ...saved, lastRunAt: ranAt, candidateCount: answer.result.candidates.length, runs: [...saved.runs, { id: answer.id, ranAt, candidateCount: answer.result.candidates.length }] }
    preselect()
    return true
  }

  /** Keeps the selection where the candidates still exist; else the two best. */
  function preselect(): void {
    const candidates = result.value?.candidates ?? []
    const kept = selected.value.filter((key) => candidates.some((c) => candidateKey(c) === key))
    selected.value = kept.length > 0 ? kept : candidates.slice(0, 2).map(candidateKey)
  }

  async function reloadFromServer(): Promise<void> {
    const current = record.value
    if (!current) return
    await guard('load', async () => adopt(await studiesApi.getStudy(current.id)))
  }

  /** After a stale-version refusal: keep this editor's inputs over the newer saved ones. */
  async function overwrite(): Promise<void> {
    const current = record.value
    const valid = input.value
    if (!current || !valid) return
    await guard('save', async () => {
      const latest = await studiesApi.getStudy(current.id)
      const saved = await studiesApi.updateStudy(current.id, valid, latest.version)
      record.value = saved
      savedInputJson.value = JSON.stringify(candidateInput.value.raw)
      conflict.value = false
    })
  }

  async function share(on: boolean): Promise<void> {
    const current = record.value
    if (!current) return
    await guard('share', async () => {
      const next = on ? await studiesApi.shareStudy(current.id) : await studiesApi.unshareStudy(current.id)
      record.value = { ...current, shareToken: next.shareToken, shared: next.shared, version: next.version }
    })
  }

  function toggleSelected(key: string): void {
    if (selected.value.includes(key)) selected.value = selected.value.filter((k) => k !== key)
    else if (selected.value.length < 4) selected.value = [...selected.value, key]
  }

  return {
    draft,
    record,
    readOnly,
    run,
    previewResult,
    demoFans,
    demoFansFailure,
    serverFields,
    failure,
    conflict,
    attempted,
    busy,
    selected,
    fromVariant,
    density,
    input,
    fieldErrors,
    blockingErrors,
    preview: computed(() => previewState.value.curves),
    dirty,
    resultsStale,
    result,
    changes,
    selectedCandidates,
    errorFor,
    noteFor,
    reset,
    loadDemoFans,
    pickDemoFan,
    loadStudy,
    loadShared,
    save,
    runNow,
    reloadFromServer,
    overwrite,
    share,
    toggleSelected,
  }
})
