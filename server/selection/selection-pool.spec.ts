import { afterAll, describe, expect, it } from 'vitest'
import { studyInputSchema, type StudyInput } from '../../shared/contracts/study.contract'
import { StudyInputError } from '../../shared/selection/air'
import { runSelection, type CatalogueEntry } from '../../shared/selection/run-selection'
import { demoCatalogueEntries } from '../seed/demo-entries'
import { DEMO_FANS } from '../seed/demo-fans'
import { SelectionPool, SelectionPoolError } from './selection-pool'

const entries = demoCatalogueEntries()

function study(fanCode: string, volts: number, hz: number): StudyInput {
  const fan = DEMO_FANS.find((item) => item.code === fanCode)
  if (!fan) throw new Error(`no demo fan ${fanCode}`)
  return studyInputSchema.parse({
    name: 'pool spec',
    fan: { source: 'curve', refRpm: fan.refRpm, refDensity: fan.refDensity, points: fan.points },
    duty: fan.suggestedDuty,
    system: {},
    supply: { volts, hz },
    ambient: {},
    energy: {},
    constraints: { activeOnly: false },
    tolerance: {},
  })
}

/** The pool's answer read back (its text parsed): compared figure for figure with runSelection's object. */
async function pooled(pool: SelectionPool, revision: number, list: readonly CatalogueEntry[], input: StudyInput): Promise<unknown> {
  return JSON.parse(await pool.runJson(revision, list, input))
}

describe('SelectionPool (worker threads)', () => {
  const pool = new SelectionPool(2)
  afterAll(() => pool.close())

  it('answers every study exactly as a run in this thread does', async () => {
    for (const fan of DEMO_FANS) {
      for (const [volts, hz] of [[120, 60], [230, 50]] as const) {
        const input = study(fan.code, volts, hz)
        expect(await pooled(pool, 1, entries, input), `${fan.code} ${volts} V`).toEqual(runSelection(entries, input))
      }
    }
  })

  it('runs concurrent studies without mixing their answers', async () => {
    const inputs = DEMO_FANS.map((fan) => study(fan.code, 120, 60))
    const answers = await Promise.all(inputs.map((input) => pooled(pool, 1, entries, input)))
    answers.forEach((answer, index) => expect(answer).toEqual(runSelection(entries, inputs[index] as StudyInput)))
  })

  it('takes up a new catalogue revision', async () => {
    const fewer = entries.filter((entry) => entry.type === 'shaded-pole')
    expect(fewer.length).toBeGreaterThan(0)
    expect(fewer.length).toBeLessThan(entries.length)
    const input = study(DEMO_FANS[0]?.code ?? '', 120, 60)
    const expected = runSelection(fewer, input)
    expect(await pooled(pool, 2, fewer, input)).toEqual(expected)
    expect(expected.candidates.every((candidate) => candidate.type === 'shaded-pole')).toBe(true)
  })

  it('gives a study whose inputs do not fit a field error, as in this thread', async () => {
    const input = study(DEMO_FANS[0]?.code ?? '', 120, 60)
    // A duty far beyond the fan's curve: the system curve through it misses the fan.
    const impossible = { ...input, duty: { flowM3s: input.duty.flowM3s * 50, staticPa: input.duty.staticPa * 50 } }
    const here = (() => {
      try {
        runSelection(entries, impossible)
        return undefined
      } catch (error) {
        return error
      }
    })()
    const there = await pool.runJson(2, entries, impossible).then(
      () => undefined,
      (error: unknown) => error,
    )
    if (here === undefined) expect(there).toBeUndefined()
    else {
      expect(there).toBeInstanceOf(StudyInputError)
      expect(there).toMatchObject({ field: (here as StudyInputError).field })
    }
  })

  it('refuses to run once closed', async () => {
    const closing = new SelectionPool(1)
    const input = study(DEMO_FANS[0]?.code ?? '', 120, 60)
    await closing.runJson(1, entries, input)
    await closing.close()
    await expect(closing.runJson(1, entries, input)).rejects.toBeInstanceOf(SelectionPoolError)
  })
})
