/**
 * Micro-benchmark of the engineering core (not a test): operating-point solves per second on one
 * core for measured-curve and PSC circuit motors on fan loads, with prepared inputs, plus motor
 * evaluations per solve. Prints one JSON line per case, then a short table.
 *
 *   npm run bench:core            (about 1 s per case)
 *   npm run bench:core -- 3       (seconds per case)
 */
import { prepareLoad, prepareMotor, solveOperatingPoint, type FanLoad, type MotorModel } from '../shared/engineering'
import { axialFan, blowerFan, pscCircuit, shadedPoleCurve } from '../shared/engineering/examples'

const seconds = Number(process.argv[2] ?? 1) > 0 ? Number(process.argv[2] ?? 1) : 1

interface Case {
  name: string
  motor: MotorModel
  load: FanLoad
}

const cases: Case[] = [
  { name: 'curve motor + fan, no offset', motor: shadedPoleCurve, load: axialFan },
  { name: 'curve motor + fan, 5 Pa offset', motor: shadedPoleCurve, load: { ...blowerFan, system: { k: 60000, offsetPa: 5 } } },
  { name: 'PSC circuit + fan, 20 Pa offset', motor: pscCircuit, load: blowerFan },
  { name: 'PSC circuit + fan, no offset', motor: pscCircuit, load: { ...blowerFan, system: { k: 6000 } } },
]

interface Row {
  case: string
  solvesPerSecond: number
  evaluationsMean: number
  evaluationsMax: number
  solves: number
}

const rows: Row[] = []
let sink = 0
for (const c of cases) {
  const motor = prepareMotor(c.motor)
  const load = prepareLoad(c.load)
  // Sweep the supply a little so every solve is a different problem (a tolerance-style study).
  const volts = Array.from({ length: 64 }, (_, i) => 207 + (46 * i) / 63)
  for (let i = 0; i < 2000; i++) sink += solveOperatingPoint(motor, load, { volts: volts[i % 64] ?? 230, hz: 50 }).rpm
  let solves = 0
  let evals = 0
  let maxEvals = 0
  const start = process.hrtime.bigint()
  const budget = BigInt(Math.round(seconds * 1e9))
  let elapsed = 0n
  while (elapsed < budget) {
    for (let i = 0; i < 256; i++) {
      const p = solveOperatingPoint(motor, load, { volts: volts[i & 63] ?? 230, hz: 50 })
      sink += p.rpm
      evals += p.evaluations
      if (p.evaluations > maxEvals) maxEvals = p.evaluations
    }
    solves += 256
    elapsed = process.hrtime.bigint() - start
  }
  const row: Row = {
    case: c.name,
    solvesPerSecond: Math.round(solves / (Number(elapsed) / 1e9)),
    evaluationsMean: Math.round((evals / solves) * 10) / 10,
    evaluationsMax: maxEvals,
    solves,
  }
  rows.push(row)
  process.stdout.write(`${JSON.stringify(row)}\n`)
}

const pad = (s: string, n: number) => s.padEnd(n)
process.stdout.write(`\n${pad('case', 34)}${pad('solves/s', 12)}${pad('evals mean', 12)}evals max\n`)
for (const r of rows) {
  process.stdout.write(`${pad(r.case, 34)}${pad(String(r.solvesPerSecond), 12)}${pad(String(r.evaluationsMean), 12)}${r.evaluationsMax}\n`)
}
if (!Number.isFinite(sink)) process.stdout.write('non-finite result seen\n')
