import { describe, expect, it } from 'vitest'
import type { FanCsvUnitChoice, FanCurveParseResult } from '../contracts/import.contract'
import { parseFanCurveCsv, splitCsvRow } from './fan-curve-csv'

// Unit factors used below (NIST SP 811, appendix B): 1 ft3/min = 4.719474e-4 m3/s,
// 1 inH2O (conventional, 4 °C) = 249.0889 Pa; 1 h = 3600 s exactly.
const CFM = 4.719474e-4
const IN_H2O = 249.0889
const M3H = 1 / 3600

const M3H_PA_W: FanCsvUnitChoice = { flow: 'm3/h', pressure: 'Pa', power: 'W' }
const SI: FanCsvUnitChoice = { flow: 'm3/s', pressure: 'Pa', power: 'W' }

describe('parseFanCurveCsv', () => {
  it('reads plain comma rows in the chosen units and converts them to SI', () => {
    const result = parseFanCurveCsv('0,120,20\n180,90,28\n360,0,30\n', M3H_PA_W)
    expect(result.errors).toEqual([])
    expect(result.points).toHaveLength(3)
    expect(result.points[1]?.flowM3s).toBeCloseTo(180 * M3H, 12)
    expect(result.points[1]?.staticPa).toBe(90)
  })

  it('takes units and column order from a header and says which came from it', () => {
    const text = 'Static pressure (in wg)\tFlow (CFM)\tShaft power (W)\n0.5\t0\t20\n0.3\t100\t28\n0\t200\t30'
    const result = parseFanCurveCsv(text, M3H_PA_W)
    expect(result.errors).toEqual([])
    expect(result.units).toEqual({ flow: 'CFM', pressure: 'inH2O', power: 'W' })
    expect([...result.unitsFromHeader].sort()).toEqual(['flow', 'power', 'pressure'])
    expect(result.points[1]?.flowM3s).toBeCloseTo(100 * CFM, 7)
    expect(result.points[0]?.staticPa).toBeCloseTo(0.5 * IN_H2O, 3)
  })

  it('reads decimal commas in semicolon files and a reference speed line', () => {
    const result = parseFanCurveCsv('# speed 1550 r/min\nflow m3/h;Pa;W\n0;120,5;20\n100;80,25;25\n200;0;27', M3H_PA_W)
    expect(result.errors).toEqual([])
    expect(result.refRpm).toBe(1550)
    expect(result.points[0]?.staticPa).toBe(120.5)
  })

  it('names the line and column of a bad cell and of a flow that does not rise', () => {
    const result = parseFanCurveCsv('0,120,20\n100,abc,25\n90,50,26\n200,0,28', M3H_PA_W)
    expect(result.errors).toEqual([
      { line: 2, column: 'pressure', message: 'static pressure "abc" is not a number' },
      { line: 3, column: 'flow', message: 'flow must rise from row to row' },
    ])
  })

  it('refuses rows with too few columns and a header without shaft power', () => {
    const result = parseFanCurveCsv('flow (CFM),static (inH2O)\n0,0.5\n100,0.3', M3H_PA_W)
    expect(result.errors.map((e) => e.line)).toEqual([1, 2, 3])
    expect(result.errors[0]?.message).toMatch(/shaft power/)
  })

  it('converts the header units to SI', () => {
    const result = parseFanCurveCsv('Flow (CFM),Static (in wg),Shaft (W)\n0,0.5,20\n50,0.4,24\n100,0,27\n', SI)
    expect(result.errors).toEqual([])
    expect(result.points[1]?.flowM3s).toBeCloseTo(50 * CFM, 8)
    expect(result.points[0]?.staticPa).toBeCloseTo(0.5 * IN_H2O, 3)
  })

  // The texts the server's and the study screen's readers were once checked against each other
  // with, now with what the one reader must make of them.
  type Expected = Pick<FanCurveParseResult, 'errors' | 'units' | 'unitsFromHeader' | 'refRpm'> & {
    /** Expected points as [flow m3/s, static Pa, shaft W]. */
    points: [number, number, number][]
  }
  const none: Pick<Expected, 'errors' | 'unitsFromHeader' | 'refRpm'> = { errors: [], unitsFromHeader: [], refRpm: null }
  const CASES: [string, string, Expected][] = [
    ['plain commas', '0,120,20\n0.05,90,28\n0.1,0,30\n', { ...none, units: SI, points: [[0, 120, 20], [0.05, 90, 28], [0.1, 0, 30]] }],
    [
      'a header with units and a speed line',
      '# speed 1550 r/min\nFlow (CFM),Static (in wg),Shaft (W)\n0,0.5,20\n50,0.4,24\n100,0.2,27\n130,0,28\n',
      {
        ...none,
        refRpm: 1550,
        units: { flow: 'CFM', pressure: 'inH2O', power: 'W' },
        unitsFromHeader: ['flow', 'pressure', 'power'],
        points: [[0, 0.5 * IN_H2O, 20], [50 * CFM, 0.4 * IN_H2O, 24], [100 * CFM, 0.2 * IN_H2O, 27], [130 * CFM, 0, 28]],
      },
    ],
    [
      'semicolons with decimal commas',
      'flow m3/h;Pa;W\n0;120,5;20\n100;80,25;25\n200;0;27',
      { ...none, units: M3H_PA_W, unitsFromHeader: ['flow', 'pressure', 'power'], points: [[0, 120.5, 20], [100 * M3H, 80.25, 25], [200 * M3H, 0, 27]] },
    ],
    [
      'tabs with the columns in another order',
      'Static Pa\tFlow m3/h\tShaft W\n120\t0\t20\n80\t100\t25\n0\t200\t27\n',
      { ...none, units: M3H_PA_W, unitsFromHeader: ['pressure', 'flow', 'power'], points: [[0, 120, 20], [100 * M3H, 80, 25], [200 * M3H, 0, 27]] },
    ],
    [
      'a bad cell and a falling flow',
      '0,120,20\n100,abc,25\n90,50,26\n200,0,28\n',
      {
        ...none,
        units: SI,
        errors: [
          { line: 2, column: 'pressure', message: 'static pressure "abc" is not a number' },
          { line: 3, column: 'flow', message: 'flow must rise from row to row' },
        ],
        points: [[0, 120, 20], [200, 0, 28]],
      },
    ],
    [
      'a header without the power column',
      'flow (CFM),static (inH2O)\n0,0.5\n100,0.3',
      {
        ...none,
        units: { flow: 'CFM', pressure: 'inH2O', power: 'W' },
        unitsFromHeader: ['flow', 'pressure'],
        errors: [
          { line: 1, message: 'the header has no shaft power column: Spinwright needs it to know the torque the fan takes' },
          { line: 2, message: 'expected 3 columns (flow, static pressure, shaft power), found 2' },
          { line: 3, message: 'expected 3 columns (flow, static pressure, shaft power), found 2' },
        ],
        points: [],
      },
    ],
    ['blank-separated columns with decimal commas', '0 120,5 20\n0,05 80 25\n0,1 0 27\n', { ...none, units: SI, points: [[0, 120.5, 20], [0.05, 80, 25], [0.1, 0, 27]] }],
    [
      'nothing but a comment',
      '# only a comment\n',
      { ...none, units: SI, errors: [{ line: 1, message: 'there is nothing to read: paste rows of flow, static pressure and shaft power' }], points: [] },
    ],
  ]

  it.each(CASES)('reads %s', (_name, text, expected) => {
    const { points, ...rest } = parseFanCurveCsv(text, SI)
    expect(rest).toEqual({ errors: expected.errors, units: expected.units, unitsFromHeader: expected.unitsFromHeader, refRpm: expected.refRpm })
    expect(points).toHaveLength(expected.points.length)
    // NIST prints its factors to 7 digits, so a relative tolerance of 1e-6 is what they allow.
    const near = (actual: number | undefined, wanted: number) => expect(Math.abs((actual ?? NaN) - wanted)).toBeLessThanOrEqual(1e-6 * Math.max(Math.abs(wanted), 1e-9))
    expected.points.forEach(([flowM3s, staticPa, shaftW], i) => {
      near(points[i]?.flowM3s, flowM3s)
      near(points[i]?.staticPa, staticPa)
      near(points[i]?.shaftW, shaftW)
    })
  })

  it('reads quoted cells with the delimiter inside and doubled quotes (RFC 4180)', () => {
    // The pressure header holds an inch mark written as "" and means inches of water gauge.
    const text = '"Flow, CFM","Static pressure ("" wg)","Shaft power, W"\n0,"0,5",20\n"50", "0,4" ,24\n100,0,"27"\n"1""2",0,28\n'
    const result = parseFanCurveCsv(text, M3H_PA_W)
    expect(result.units).toEqual({ flow: 'CFM', pressure: 'inH2O', power: 'W' })
    expect(result.unitsFromHeader).toEqual(['flow', 'pressure', 'power'])
    // The comma delimiter means decimal points: "0,5" is one cell and not a number.
    expect(result.errors).toEqual([
      { line: 2, column: 'pressure', message: 'static pressure "0,5" is not a number' },
      { line: 3, column: 'pressure', message: 'static pressure "0,4" is not a number' },
      { line: 5, column: 'flow', message: 'flow "1"2" is not a number' },
    ])
    expect(result.points).toHaveLength(1)
    expect(result.points[0]?.flowM3s).toBeCloseTo(100 * CFM, 8)
    expect(result.points[0]?.shaftW).toBe(27)
  })

  it('reads quoted decimal-comma cells in a semicolon file', () => {
    const result = parseFanCurveCsv('"Flow; m3/h";"Static; Pa";"Shaft; W"\n"0";"120,5";"20"\n"100";"80,25";25\n200;0;"27"', M3H_PA_W)
    expect(result.errors).toEqual([])
    expect(result.points.map((p) => p.staticPa)).toEqual([120.5, 80.25, 0])
  })

  it('names the line of a quote that is never closed, counting comment lines', () => {
    const result = parseFanCurveCsv('0,120,20\n# fan A\n100,"80,25\n200,0,27', M3H_PA_W)
    expect(result.errors).toEqual([{ line: 3, message: 'the text is not readable CSV: cell 2 opens a quote that is not closed on its line' }])
    expect(result.points).toEqual([])
  })

  it('refuses text after a closing quote', () => {
    const result = parseFanCurveCsv('0,120,20\n100,"80"5,25\n200,0,27', M3H_PA_W)
    expect(result.errors).toEqual([{ line: 2, message: 'the text is not readable CSV: cell 2 goes on after its closing quote (write a quote inside a quoted cell as "")' }])
  })

  it('ignores a byte-order mark and reads CRLF line ends', () => {
    const result = parseFanCurveCsv('\uFEFFFlow (m3/h),Static (Pa),Shaft (W)\r\n0,120,20\r\n100,80,25\r\n200,0,27\r\n', SI)
    expect(result.errors).toEqual([])
    expect(result.units.flow).toBe('m3/h')
    expect(result.points[2]?.flowM3s).toBeCloseTo(200 * M3H, 12)
  })
})

describe('splitCsvRow', () => {
  it('cuts on the delimiter and trims blanks around cells', () => {
    expect(splitCsvRow(' 1 , 2 ,3', ',')).toEqual({ cells: ['1', '2', '3'] })
    expect(splitCsvRow('1,2,', ',')).toEqual({ cells: ['1', '2', ''] })
    expect(splitCsvRow(' \t x\t y ', '\t')).toEqual({ cells: ['', 'x', 'y'] })
  })

  it('keeps the delimiter and blanks inside quotes and halves doubled quotes', () => {
    expect(splitCsvRow('"a,b", " c ","x""y",""', ',')).toEqual({ cells: ['a,b', ' c ', 'x"y', ''] })
    expect(splitCsvRow('"""",1', ',')).toEqual({ cells: ['"', '1'] })
  })

  it('keeps a quote inside an unquoted cell as text', () => {
    expect(splitCsvRow('2" wg,a""b', ',')).toEqual({ cells: ['2" wg', 'a""b'] })
  })

  it('treats a run of blanks as one delimiter when the delimiter is a blank', () => {
    expect(splitCsvRow('  0,5 \t 120,5   "Shaft W" ', ' ')).toEqual({ cells: ['0,5', '120,5', 'Shaft W'] })
  })

  it('says which cell has a broken quote', () => {
    expect(splitCsvRow('1,"2', ',')).toEqual({ problem: 'cell 2 opens a quote that is not closed on its line' })
    expect(splitCsvRow('"a"b;1', ';')).toEqual({ problem: 'cell 1 goes on after its closing quote (write a quote inside a quoted cell as "")' })
    expect(splitCsvRow('"a"b 1', ' ')).toEqual({ problem: 'cell 1 goes on after its closing quote (write a quote inside a quoted cell as "")' })
  })
})
