import { describe, expect, it } from 'vitest'
import type { FanCsvUnitChoice } from '../../shared/contracts/import.contract'
import { parseFanCurveCsv } from './fan-curve-csv'

// The study screen's own reader, loaded at run time: src/ belongs to the SPA's TypeScript project.
const BROWSER_READER = '../../src/composables/useFanCsv'
type Reader = (text: string, units: FanCsvUnitChoice) => unknown
async function browserReader(): Promise<Reader> {
  const module: unknown = await import(/* @vite-ignore */ BROWSER_READER)
  if (typeof module !== 'object' || module === null || !('parseFanCsv' in module) || typeof module.parseFanCsv !== 'function') throw new Error('parseFanCsv not found')
  const reader = module.parseFanCsv
  return (text, units) => reader(text, units)
}

const SI = { flow: 'm3/s', pressure: 'Pa', power: 'W' } as const
const CASES: [string, string][] = [
  ['plain commas', '0,120,20\n0.05,90,28\n0.1,0,30\n'],
  ['header with units and speed line', '# speed 1550 r/min\nFlow (CFM),Static (in wg),Shaft (W)\n0,0.5,20\n50,0.4,24\n100,0.2,27\n130,0,28\n'],
  ['semicolons with decimal commas', 'flow m3/h;Pa;W\n0;120,5;20\n100;80,25;25\n200;0;27'],
  ['tabs, reordered columns', 'Static Pa\tFlow m3/h\tShaft W\n120\t0\t20\n80\t100\t25\n0\t200\t27\n'],
  ['bad cells and falling flow', '0,120,20\n100,abc,25\n90,50,26\n200,0,28\n'],
  ['missing power column', 'flow (CFM),static (inH2O)\n0,0.5\n100,0.3'],
  ['blank-separated with decimal commas', '0 120,5 20\n0,05 80 25\n0,1 0 27\n'],
  ['nothing to read', '# only a comment\n'],
]

describe('parseFanCurveCsv (server) against parseFanCsv (browser)', () => {
  it.each(CASES)('reads %s exactly as the study screen does', async (_name, text) => {
    const parseFanCsv = await browserReader()
    expect(parseFanCurveCsv(text, SI)).toEqual(parseFanCsv(text, SI))
  })

  it('converts the header units to SI (NIST SP 811: 1 ft3/min = 4.719474e-4 m3/s, 1 inH2O = 249.0889 Pa)', () => {
    const result = parseFanCurveCsv('Flow (CFM),Static (in wg),Shaft (W)\n0,0.5,20\n50,0.4,24\n100,0,27\n', SI)
    expect(result.errors).toEqual([])
    expect(result.points[1]?.flowM3s).toBeCloseTo(50 * 4.719474e-4, 8)
    expect(result.points[0]?.staticPa).toBeCloseTo(0.5 * 249.0889, 3)
  })
})
