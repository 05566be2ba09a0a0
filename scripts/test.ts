// `npm test`: type-check, unit tests, API tests over a throwaway MariaDB and end-to-end tests in
// Debian's Chromium. Ends with one line `N passed, N failed, N skipped` totalled over the suites.
import { spawn } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import path from 'node:path'
import { ensureChromium } from './lib/chromium'
import { startMaria, type MariaInstance } from './lib/mariadb'
import { say } from './lib/log'
import { localEnvironment } from './lib/environment'
import { ROOT, buildClientIfStale, freePort, onShutdown, startFakes, type FakeServices } from './lib/services'

interface Tally {
  suite: string
  passed: number
  failed: number
  skipped: number
}

const bin = (name: string): string => path.join(ROOT, 'node_modules', '.bin', name)
/** `.data/test`, or a folder of this run's own while another run (a colleague's) holds that one. */
function chooseTestDir(): string {
  const preferred = path.resolve(process.env.TEST_DIR ?? '.data/test')
  const lock = path.join(preferred, 'run.pid')
  if (existsSync(lock)) {
    const pid = Number(readFileSync(lock, 'utf8'))
    let alive = false
    try {
      process.kill(pid, 0)
      alive = pid !== process.pid
    } catch {
      alive = false
    }
    if (alive) return path.resolve(`.data/test-${process.pid}`)
  }
  return preferred
}
const testDir = chooseTestDir()

/** The suite running now (vitest or playwright), so a stop signal reaches it as well. */
let runningSuite: ReturnType<typeof spawn> | undefined

function run(command: string, args: string[], env: NodeJS.ProcessEnv): Promise<number> {
  return new Promise((resolve) => {
    const child = spawn(command, args, { env, stdio: 'inherit' })
    runningSuite = child
    child.on('exit', (code, signal) => {
      if (runningSuite === child) runningSuite = undefined
      resolve(code ?? (signal ? 1 : 0))
    })
  })
}

/** Stops the running suite (SIGTERM, then SIGKILL after 10 s) and waits for it. */
async function stopRunningSuite(): Promise<void> {
  const child = runningSuite
  if (!child || child.exitCode !== null || child.signalCode !== null) return
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()))
  child.kill('SIGTERM')
  const timer = setTimeout(() => child.kill('SIGKILL'), 10_000)
  await exited
  clearTimeout(timer)
}

interface VitestJson {
  numPassedTests: number
  numFailedTests: number
  numPendingTests: number
  numTodoTests: number
  numFailedTestSuites: number
}

function readVitest(file: string, suite: string, exitCode: number): Tally {
  if (!existsSync(file)) return { suite, passed: 0, failed: 1, skipped: 0 }
  const report: VitestJson = JSON.parse(readFileSync(file, 'utf8'))
  // A suite that fails to load has no failed test but must still count as a failure.
  const failed = report.numFailedTests + (report.numFailedTests === 0 && (report.numFailedTestSuites > 0 || exitCode !== 0) ? 1 : 0)
  return { suite, passed: report.numPassedTests, failed, skipped: report.numPendingTests + report.numTodoTests }
}

interface PlaywrightJson {
  stats: { expected: number; unexpected: number; flaky: number; skipped: number }
}

function readPlaywright(file: string, exitCode: number): Tally {
  if (!existsSync(file)) return { suite: 'e2e', passed: 0, failed: 1, skipped: 0 }
  const report: PlaywrightJson = JSON.parse(readFileSync(file, 'utf8'))
  const { expected, unexpected, flaky, skipped } = report.stats
  const failed = unexpected + (unexpected === 0 && exitCode !== 0 ? 1 : 0)
  return { suite: 'e2e', passed: expected + flaky, failed, skipped }
}

async function main(): Promise<number> {
  const tallies: Tally[] = []
  const only = new Set((process.env.TEST_ONLY ?? 'types,unit,api,e2e').split(','))
  let maria: MariaInstance | undefined
  let fakes: FakeServices | undefined
  let server: ReturnType<typeof spawn> | undefined
  let cleaned = false
  const cleanUp = async (): Promise<void> => {
    if (cleaned) return
    cleaned = true
    if (server && server.exitCode === null) {
      server.kill('SIGTERM')
      await new Promise((resolve) => server?.once('exit', resolve))
    }
    await fakes?.stop()
    await maria?.stop()
    rmSync(path.join(testDir, 'run.pid'), { force: true })
  }
  // Interrupted (Ctrl-C, CI timeout): stop what was started before going.
  onShutdown(async () => {
    await stopRunningSuite()
    await cleanUp()
    console.log('0 passed, 1 failed')
    process.exit(1)
  })
  const reports = path.join(testDir, 'reports')
  try {
    rmSync(testDir, { recursive: true, force: true })
    mkdirSync(reports, { recursive: true })
    writeFileSync(path.join(testDir, 'run.pid'), String(process.pid))
    say(`test folder ${path.relative(ROOT, testDir)}`)

    if (only.has('types')) {
      say('type-check (vue-tsc --build) ...')
      const code = await run(bin('vue-tsc'), ['--build', '--force'], process.env)
      tallies.push({ suite: 'type-check', passed: code === 0 ? 1 : 0, failed: code === 0 ? 0 : 1, skipped: 0 })
    }

    if (only.has('unit')) {
      say('unit tests ...')
      const file = path.join(reports, 'unit.json')
      const code = await run(bin('vitest'), ['run', '--project', 'unit', '--reporter=default', '--reporter=json', `--outputFile.json=${file}`], process.env)
      tallies.push(readVitest(file, 'unit', code))
    }

    if (only.has('api') || only.has('e2e')) {
      const dbPort = await freePort(3317)
      maria = await startMaria({ dir: path.join(testDir, 'mariadb'), port: dbPort, database: 'spinwright_test', user: 'spinwright', password: 'spinwright-test' })
      say(`throwaway MariaDB on 127.0.0.1:${dbPort}`)
    }

    if (only.has('api') && maria) {
      say('API tests ...')
      const file = path.join(reports, 'api.json')
      const env: NodeJS.ProcessEnv = { ...process.env, TEST_DB_PORT: String(maria.port), TEST_DB_PASSWORD: 'spinwright-test', TEST_DB_SOCKET: maria.socket }
      const code = await run(bin('vitest'), ['run', '--project', 'api', '--reporter=default', '--reporter=json', `--outputFile.json=${file}`], env)
      tallies.push(readVitest(file, 'api', code))
    }

    if (only.has('e2e') && maria) {
      say('end-to-end tests in Chromium ...')
      const chromium = ensureChromium()
      const ports = {
        app: await freePort(8180),
        db: maria.port,
        smtp: await freePort(2625),
        mailbox: await freePort(2680),
        payments: await freePort(12211),
      }
      const env: NodeJS.ProcessEnv = {
        ...localEnvironment(path.join(testDir, 'app'), ports, 'spinwright_e2e'),
        DB_PASSWORD: 'spinwright-test',
        SIGNIN_LIMIT_PER_IP: '1000',
        CHROMIUM_PATH: chromium,
        BASE_URL: `http://127.0.0.1:${ports.app}`,
        SCREENSHOT_DIR: path.join(testDir, 'screenshots'),
        PLAYWRIGHT_OUTPUT_DIR: path.join(testDir, 'e2e-output'),
      }
      // The e2e database is separate from the API tests' one, and seeded like a fresh `npm start`.
      await createDatabase(maria, 'spinwright_e2e')
      const { prepareDatabase } = await import('../server/db/prepare')
      await prepareDatabase(env)
      // A build of this run's own: colleagues' runs and `npm start` keep their dist/ untouched.
      const clientDir = path.join(testDir, 'dist')
      buildClientIfStale(clientDir)
      env.CLIENT_DIR = clientDir
      if (existsSync('server/fakes/main.ts')) fakes = await startFakes(env)
      server = spawn(bin('tsx'), ['--tsconfig', 'tsconfig.server.json', 'server/main.ts'], { env, stdio: ['ignore', 'pipe', 'inherit'] })
      await waitForLine(server, 'API listening', 60_000)
      const file = path.join(reports, 'e2e.json')
      // E2E_ARGS passes files or options to playwright (e.g. E2E_ARGS=tests/e2e/study.e2e.ts).
      const extra = (process.env.E2E_ARGS ?? '').split(/\s+/).filter(Boolean)
      const code = await run(bin('playwright'), ['test', ...extra], { ...env, PLAYWRIGHT_JSON_OUTPUT_NAME: file })
      tallies.push(readPlaywright(file, code))
    }
  } catch (error) {
    console.error(error)
    tallies.push({ suite: 'set-up', passed: 0, failed: 1, skipped: 0 })
  } finally {
    await cleanUp()
  }

  console.log('')
  for (const tally of tallies) say(`${tally.suite.padEnd(10)} ${tally.passed} passed, ${tally.failed} failed, ${tally.skipped} skipped`)
  const total = tallies.reduce((sum, tally) => ({ passed: sum.passed + tally.passed, failed: sum.failed + tally.failed, skipped: sum.skipped + tally.skipped }), { passed: 0, failed: 0, skipped: 0 })
  console.log(`${total.passed} passed, ${total.failed} failed, ${total.skipped} skipped`)
  return total.failed === 0 && total.passed > 0 ? 0 : 1
}

async function createDatabase(maria: MariaInstance, database: string): Promise<void> {
  const mysql = await import('mysql2/promise')
  const connection = await mysql.createConnection({ socketPath: maria.socket, user: 'root', password: '' })
  try {
    await connection.query(`DROP DATABASE IF EXISTS \`${database}\``)
    await connection.query(`CREATE DATABASE \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`)
    await connection.query(`GRANT ALL PRIVILEGES ON *.* TO 'spinwright'@'127.0.0.1'`)
  } finally {
    await connection.end()
  }
}

function waitForLine(child: ReturnType<typeof spawn>, text: string, timeoutMs: number): Promise<void> {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`server did not print "${text}" within ${timeoutMs} ms`)), timeoutMs)
    child.once('exit', (code) => reject(new Error(`server exited with code ${code}`)))
    child.stdout?.on('data', (chunk: Buffer) => {
      process.stdout.write(chunk)
      if (chunk.toString().includes(text)) {
        clearTimeout(timer)
        resolve()
      }
    })
  })
}

main()
  .then((code) => process.exit(code))
  .catch((error: unknown) => {
    console.error(error)
    console.log('0 passed, 1 failed')
    process.exit(1)
  })
