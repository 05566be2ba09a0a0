/**
 * Command-line operating-point solver: `npm run solve -- case.json`.
 *
 * The case file holds { motor, load, supply, options? } in the engineering core's types, plus
 * optional studies: "tolerance" (ToleranceOptions, {} for the defaults), "capacitorsUf" (a PSC
 * capacitor sweep) and "energy" ({ hoursPerYear, tariffPerKWh, years, purchasePrice? }).
 * Prints the result as JSON; bad input prints the offending field and exits 1.
 */
import { readFileSync } from 'node:fs'
import {
  EngineeringInputError, capacitorSweep, dutyFigures, prepareLoad, prepareMotor, solveOperatingPoint, toleranceAnalysis,
  validateLoad, validateMotor, validateSolveOptions, validateSupply, type EnergyInput,
} from '../shared/engineering'

function fail(message: string): never {
  process.stderr.write(`${message}\n`)
  process.exit(1)
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v)
}

function numberArray(v: unknown): number[] {
  if (!Array.isArray(v)) throw new EngineeringInputError('capacitorsUf', 'must be an array of numbers')
  return v.map((x, i) => {
    if (typeof x !== 'number') throw new EngineeringInputError(`capacitorsUf[${i}]`, 'must be a number')
    return x
  })
}

function energyInput(v: unknown): Omit<EnergyInput, 'inputW'> {
  if (!isRecord(v)) throw new EngineeringInputError('energy', 'must be an object')
  const num = (k: string): number => {
    const x = v[k]
    if (typeof x !== 'number') throw new EngineeringInputError(`energy.${k}`, 'must be a number')
    return x
  }
  const out: Omit<EnergyInput, 'inputW'> = { hoursPerYear: num('hoursPerYear'), tariffPerKWh: num('tariffPerKWh'), years: num('years') }
  if (v.purchasePrice !== undefined) out.purchasePrice = num('purchasePrice')
  return out
}

const file = process.argv[2]
if (!file) fail('usage: npm run solve -- case.json   (a JSON file with motor, load, supply and optional options)')

let input: unknown
try {
  input = JSON.parse(readFileSync(file, 'utf8'))
} catch (err) {
  fail(`cannot read ${file}: ${err instanceof Error ? err.message : String(err)}`)
}

try {
  if (!isRecord(input)) throw new EngineeringInputError('(case)', 'the case must be a JSON object with motor, load and supply')
  const motor = prepareMotor(validateMotor(input.motor, 'motor'))
  const load = prepareLoad(validateLoad(input.load, 'load'))
  const supply = validateSupply(input.supply, 'supply')
  const options = validateSolveOptions(input.options, 'options')
  const point = solveOperatingPoint(motor, load, supply, options)
  const result: Record<string, unknown> = { point }
  result.figures = dutyFigures(motor, supply, point, input.energy === undefined ? undefined : energyInput(input.energy))
  if (input.tolerance !== undefined) {
    result.tolerance = toleranceAnalysis(motor, load, supply, isRecord(input.tolerance) ? { ...input.tolerance, solve: options } : { solve: options })
  }
  if (input.capacitorsUf !== undefined) {
    result.capacitorSweep = capacitorSweep(motor.source, load, supply, numberArray(input.capacitorsUf), options)
  }
  process.stdout.write(`${JSON.stringify(result, null, 2)}\n`)
} catch (err) {
  if (err instanceof EngineeringInputError) fail(`error: ${err.field}: ${err.message.slice(err.field.length + 2)}`)
  throw err
}
