// The benchmark's own scratch stack under .data/bench: MariaDB on a free port with a fresh demo
// database, the SPA built into .data/bench/dist, the app in a child process on a free loopback
// port, and an in-process app handle over the same database for server-side timings.
import 'reflect-metadata'
import { spawn, type ChildProcess } from 'node:child_process'
import { mkdirSync, rmSync, symlinkSync } from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import type { DataSource } from 'typeorm'
import { startMaria, recreateDatabase, type MariaInstance } from '../lib/mariadb'
import { localEnvironment } from '../lib/environment'
import { ROOT, buildClientIfStale, freePort } from '../lib/services'
import { progress } from './report'
import { loadConfig } from '../../server/config'
import { createDataSource } from '../../server/db/data-source'
import { prepareDatabase } from '../../server/db/prepare'
import { createApp, type AppHandle } from '../../server/app'

export interface BenchStack {
  /** http://127.0.0.1:PORT of the app in its child process. */
  baseUrl: string
  env: NodeJS.ProcessEnv
  dataSource: DataSource
  handle: AppHandle
  clientDir: string | undefined
  stop(): Promise<void>
}

const DATABASE = 'spinwright_bench'

function waitForLine(child: ChildProcess, text: string, timeoutMs: number): Promise<void> {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`the app did not print "${text}" within ${timeoutMs / 1000} s`)), timeoutMs)
    child.once('exit', (code) => {
      clearTimeout(timer)
      reject(new Error(`the app exited with code ${code} during start-up`))
    })
    child.stdout?.on('data', (chunk: Buffer) => {
      if (process.env.SPINWRIGHT_VERBOSE) process.stderr.write(chunk)
      if (chunk.toString().includes(text)) {
        clearTimeout(timer)
        resolve()
      }
    })
  })
}

async function stopChild(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()))
  child.kill('SIGTERM')
  const timer = setTimeout(() => child.kill('SIGKILL'), 15_000)
  await exited
  clearTimeout(timer)
}

/** Starts the scratch stack; `withClient` builds the SPA (needed by the client part only). */
export async function startBenchStack(withClient: boolean): Promise<BenchStack> {
  const dir = path.resolve(process.env.BENCH_DIR ?? path.join(ROOT, '.data', 'bench'))
  mkdirSync(dir, { recursive: true })
  let maria: MariaInstance | undefined
  let server: ChildProcess | undefined
  let dataSource: DataSource | undefined
  let handle: AppHandle | undefined
  let clientLink: string | undefined
  const stop = async (): Promise<void> => {
    if (server) await stopChild(server)
    handle?.close()
    if (dataSource?.isInitialized) await dataSource.destroy()
    await maria?.stop()
    if (clientLink) rmSync(clientLink, { force: true })
  }
  try {
    const dbPort = await freePort(3417)
    maria = await startMaria({ dir: path.join(dir, 'mariadb'), port: dbPort, database: DATABASE, user: 'spinwright', password: 'spinwright-bench' })
    // Every run starts from the demo catalogue alone: the selection part grows it afterwards.
    await recreateDatabase(maria.socket, DATABASE)
    const appPort = await freePort(8480)
    const ports = { app: appPort, db: dbPort, smtp: await freePort(2725), mailbox: await freePort(2780), payments: await freePort(12411) }
    const env: NodeJS.ProcessEnv = {
      ...localEnvironment(path.join(dir, 'app'), ports, DATABASE),
      HOST: '127.0.0.1',
      PORT: String(appPort),
      DB_HOST: '127.0.0.1',
      DB_PORT: String(dbPort),
      DB_NAME: DATABASE,
      DB_USER: 'spinwright',
      DB_PASSWORD: 'spinwright-bench',
      NODE_ENV: 'production',
    }
    progress(`bench MariaDB on 127.0.0.1:${dbPort}; migrating and seeding the demo data ...`)
    await prepareDatabase(env)
    let clientDir: string | undefined
    if (withClient) {
      clientDir = path.join(dir, 'dist')
      buildClientIfStale(clientDir)
      // Workaround: the SPA fallback's res.sendFile refuses any path with a dot-folder in it
      // (send's dotfiles: 'ignore'), so .data/... answers 404; serve the build through a link
      // from the temp folder until app.ts passes a root. Removed again in stop().
      clientLink = path.join(os.tmpdir(), `spinwright-bench-dist-${process.pid}`)
      rmSync(clientLink, { force: true })
      symlinkSync(clientDir, clientLink, 'dir')
      env.CLIENT_DIR = clientLink
    } else {
      env.CLIENT_DIR = path.join(dir, 'no-client')
    }
    // The app under load runs in its own process, so the load generator does not share its event loop.
    // BENCH_APP_NODE_ARGS (e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof") runs the app's node with them,
    // tsx as its loader (node itself, so the profile is the app's).
    const nodeArgs = process.env.BENCH_APP_NODE_ARGS?.split(/\s+/).filter(Boolean)
    server = nodeArgs
      ? spawn(process.execPath, [...nodeArgs, '--import', 'tsx', 'server/main.ts'], { env: { ...env, TSX_TSCONFIG_PATH: 'tsconfig.server.json' }, stdio: ['ignore', 'pipe', 'inherit'] })
      : spawn(path.join(ROOT, 'node_modules', '.bin', 'tsx'), ['--tsconfig', 'tsconfig.server.json', 'server/main.ts'], { env, stdio: ['ignore', 'pipe', 'inherit'] })
    await waitForLine(server, 'API listening', 120_000)
    const config = loadConfig(env)
    dataSource = createDataSource(config)
    await dataSource.initialize()
    handle = createApp({ config, dataSource })
    const baseUrl = `http://127.0.0.1:${appPort}`
    progress(`bench app on ${baseUrl} (pid ${server.pid})`)
    return { baseUrl, env, dataSource, handle, clientDir, stop }
  } catch (error) {
    await stop()
    throw error
  }
}
