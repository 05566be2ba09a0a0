import { beforeEach, describe, expect, it } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { useStudyStore } from './study.store'

// A plausible small blower curve (invented): shut-off 300 Pa, free delivery 0.12 m3/s at 1500 r/min.
const POINTS = [
  { flowM3s: 0, staticPa: 300, shaftW: 20 },
  { flowM3s: 0.03, staticPa: 280, shaftW: 26 },
  { flowM3s: 0.06, staticPa: 230, shaftW: 32 },
  { flowM3s: 0.09, staticPa: 140, shaftW: 36 },
  { flowM3s: 0.12, staticPa: 0, shaftW: 38 },
]

function studyWithCurve() {
  const store = useStudyStore()
  store.draft.fanMode = 'points'
  store.draft.refRpm = 1500
  store.draft.points = POINTS.map((p) => ({ ...p }))
  store.draft.dutyFlowM3s = 0.06
  store.draft.dutyStaticPa = 230
  return store
}

// Fan laws (affinity laws) as ASHRAE Handbook - HVAC Systems and Equipment, chapter Fans, states them.
describe('study store validation', () => {
  beforeEach(() => setActivePinia(createPinia()))

  it('gives a contract-valid SI input for a complete draft and no field errors', () => {
    const store = studyWithCurve()
    expect(store.fieldErrors).toEqual({})
    expect(store.input?.fan).toMatchObject({ source: 'curve', refRpm: 1500 })
    expect(store.input?.duty).toEqual({ flowM3s: 0.06, staticPa: 230 })
  })

  it('names the row whose flow does not rise, on the form path of the contract', () => {
    const store = studyWithCurve()
    const third = store.draft.points[2]
    if (third) third.flowM3s = 0.02
    expect(store.input).toBeNull()
    expect(store.fieldErrors['fan.points.2.flowM3s']).toMatch(/rise|increasing/)
  })

  it('puts a duty the fan cannot reach below 2-pole synchronous speed on the duty pressure field', () => {
    const store = studyWithCurve()
    // By the fan laws p ~ n^2: at 3600 r/min (2 poles, 60 Hz) the shut-off is 300 x (3600/1500)^2 = 1728 Pa,
    // so 3000 Pa at this flow is out of reach of any motor.
    store.draft.dutyStaticPa = 3000
    expect(store.fieldErrors['duty.staticPa']).toMatch(/above what this fan can give/)
  })

  it('finds the speed at which the fan meets a duty below its curve by the fan laws', () => {
    const store = studyWithCurve()
    // With no offset the system parabola through the duty maps onto itself under the fan laws: a duty
    // at half the flow of a point on the 1500 r/min curve lying on the same parabola needs 750 r/min.
    // The operating air is the reference air here, so density plays no part.
    store.draft.densityOverride = true
    store.draft.densityKgM3 = 1.2
    store.draft.dutyFlowM3s = 0.03
    store.draft.dutyStaticPa = 230 / 4
    expect(store.preview?.rpmForDuty).toBeCloseTo(750, 3)
  })

  it('refuses an offset at or above the duty pressure on the offset field', () => {
    const store = studyWithCurve()
    store.draft.offsetPa = 230
    expect(store.fieldErrors['system.offsetPa']).toMatch(/below the duty/)
  })

  it('hides "required" until the user has tried to run, then shows it', () => {
    const store = useStudyStore()
    store.draft.fanMode = 'duty-only'
    expect(store.fieldErrors['duty.flowM3s']).toBeUndefined()
    store.attempted = true
    expect(store.fieldErrors['duty.flowM3s']).toBe('required')
  })
})
