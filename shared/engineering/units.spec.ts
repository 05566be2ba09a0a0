import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { convert, fromSI, toSI, quantityOf } from './units'

// NIST Special Publication 811 (2008), Appendix B.9 "Factors for units listed by kind of quantity".
describe('unit conversion against NIST SP 811', () => {
  it.each([
    ['CFM', 4.719474e-4, 'ft3/min = 4.719 474 E-04 m3/s'],
    ['m3/h', 2.777778e-4, 'm3/h = 1/3600 m3/s (definition)'],
    ['L/s', 1e-3, 'L = 1E-03 m3 (definition)'],
  ] as const)('1 %s in m3/s matches SP 811 (%s)', (unit, factor, _source) => {
    expect(toSI(1, unit)).toBeCloseTo(factor, 9)
  })

  it('1 inH2O is the conventional inch of water, 249.0889 Pa (SP 811: 2.490 889 E+02)', () => {
    expect(toSI(1, 'inH2O')).toBeCloseTo(249.0889, 4)
  })

  it('1 mmH2O is the conventional millimetre of water, 9.806 65 Pa (SP 811)', () => {
    expect(toSI(1, 'mmH2O')).toBeCloseTo(9.80665, 10)
  })

  it('torque: ozf in 7.061 552 E-03 N m and lbf in 1.129 848 E-01 N m (SP 811)', () => {
    expect(toSI(1, 'oz-in')).toBeCloseTo(7.061552e-3, 9)
    expect(toSI(1, 'lb-in')).toBeCloseTo(0.1129848, 7)
  })

  it('horsepower (550 ft lbf/s) is 745.6999 W (SP 811: 7.456 999 E+02)', () => {
    expect(toSI(1, 'hp')).toBeCloseTo(745.6999, 4)
  })

  it('1000 CFM is 1699.01 m3/h (from the SP 811 factor: 4.719474e-4 x 3600 x 1000)', () => {
    expect(convert(1000, 'CFM', 'm3/h')).toBeCloseTo(1699.0106, 3)
  })

  it('refuses to convert across quantities', () => {
    expect(() => convert(1, 'CFM', 'Pa')).toThrow(RangeError)
    expect(quantityOf('furlong')).toBeUndefined()
  })

  it('round trips any value through any unit (property)', () => {
    const units = ['m3/s', 'CFM', 'm3/h', 'L/s', 'Pa', 'inH2O', 'mmH2O', 'N m', 'oz-in', 'lb-in', 'W', 'hp'] as const
    fc.assert(
      fc.property(fc.constantFrom(...units), fc.double({ min: -1e6, max: 1e6, noNaN: true }), (unit, v) => {
        expect(fromSI(toSI(v, unit), unit)).toBeCloseTo(v, 6)
      }),
    )
  })
})
