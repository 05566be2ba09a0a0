import { describe, expect, it } from 'vitest'
import { parseFanCsv, type FanCsvUnits } from './useFanCsv'

const SI: FanCsvUnits = { flow: 'm3/h', pressure: 'Pa', power: 'W' }

describe('parseFanCsv', () => {
  it('reads plain comma rows in the chosen units and converts them to SI', () => {
    const result = parseFanCsv('0,120,20\n180,90,28\n360,0,30\n', SI)
    expect(result.errors).toEqual([])
    expect(result.points).toHaveLength(3)
    // 180 m3/h = 0.05 m3/s (1 h = 3600 s, exact).
    expect(result.points[1]?.flowM3s).toBeCloseTo(0.05, 12)
    expect(result.points[1]?.staticPa).toBe(90)
  })

  it('takes units and column order from a header and says which came from it', () => {
    const text = 'Static pressure (in wg)\tFlow (CFM)\tShaft power (W)\n0.5\t0\t20\n0.3\t100\t28\n0\t200\t30'
    const result = parseFanCsv(text, SI)
    expect(result.errors).toEqual([])
    expect(result.units).toEqual({ flow: 'CFM', pressure: 'inH2O', power: 'W' })
    expect(result.unitsFromHeader.sort()).toEqual(['flow', 'power', 'pressure'])
    // NIST SP 811: 1 ft3/min = 4.719474e-4 m3/s; 1 inH2O (conventional) = 249.0889 Pa.
    expect(result.points[1]?.flowM3s).toBeCloseTo(100 * 4.719474e-4, 7)
    expect(result.points[0]?.staticPa).toBeCloseTo(0.5 * 249.0889, 3)
  })

  it('reads decimal commas in semicolon files and a reference speed line', () => {
    const result = parseFanCsv('# speed 1550 r/min\nflow m3/h;Pa;W\n0;120,5;20\n100;80,25;25\n200;0;27', SI)
    expect(result.errors).toEqual([])
    expect(result.refRpm).toBe(1550)
    expect(result.points[0]?.staticPa).toBe(120.5)
  })

  it('names the line and column of a bad cell and of a flow that does not rise', () => {
    const result = parseFanCsv('0,120,20\n100,abc,25\n90,50,26\n200,0,28', SI)
    expect(result.errors).toEqual([
      { line: 2, column: 'pressure', message: 'static pressure "abc" is not a number' },
      { line: 3, column: 'flow', message: 'flow must rise from row to row' },
    ])
  })

  it('refuses rows with too few columns and a header without shaft power', () => {
    const result = parseFanCsv('flow (CFM),static (inH2O)\n0,0.5\n100,0.3', SI)
    expect(result.errors.map((e) => e.line)).toEqual([1, 2, 3])
    expect(result.errors[0]?.message).toMatch(/shaft power/)
  })
})
