// Runs a project-local MariaDB server from Debian's packages: one data directory, one port, one
// socket, bound to 127.0.0.1. Used by `npm start` (the demo instance) and `npm test` (a throwaway one).
import { spawn, spawnSync, type ChildProcess } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync, openSync } from 'node:fs'
import path from 'node:path'
import mysql from 'mysql2/promise'
import { say } from './log'

const SERVER_CANDIDATES = ['/usr/sbin/mariadbd', '/usr/bin/mariadbd', '/usr/sbin/mysqld']
const INSTALL_DB_CANDIDATES = ['/usr/bin/mariadb-install-db', '/usr/bin/mysql_install_db']

export interface MariaOptions {
  /** Folder holding the data directory, socket, pid file and log. */
  dir: string
  port: number
  database: string
  user: string
  password: string
}

export interface MariaInstance {
  port: number
  socket: string
  pid: number
  stop(): Promise<void>
}

function findExecutable(candidates: string[]): string | undefined {
  return candidates.find((candidate) => existsSync(candidate))
}

function isRoot(): boolean {
  return typeof process.getuid === 'function' && process.getuid() === 0
}

/** Makes sure a MariaDB server binary exists, installing Debian's package when we are root. */
export function ensureMariaInstalled(): void {
  if (findExecutable(SERVER_CANDIDATES) && findExecutable(INSTALL_DB_CANDIDATES)) return
  if (!isRoot()) {
    throw new Error(
      'MariaDB server is not installed. Install it with: sudo apt-get install -y mariadb-server (then run this command again)',
    )
  }
  say('installing mariadb-server from Debian packages (apt-get) ...')
  aptInstall(['mariadb-server'])
}

export function aptInstall(packages: string[]): void {
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  const update = spawnSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env })
  if (update.status !== 0) throw new Error('apt-get update failed')
  const install = spawnSync('apt-get', ['install', '-y', '-qq', ...packages], { stdio: 'inherit', env })
  if (install.status !== 0) throw new Error(`apt-get install ${packages.join(' ')} failed`)
}

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0)
    return true
  } catch {
    return false
  }
}

function commandLineOf(pid: number): string {
  try {
    return readFileSync(`/proc/${pid}/cmdline`, 'utf8').replaceAll('\0', ' ')
  } catch {
    return ''
  }
}

async function sleep(ms: number): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, ms))
}

async function waitForExit(pid: number, timeoutMs: number): Promise<boolean> {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    if (!processAlive(pid)) return true
    await sleep(100)
  }
  return !processAlive(pid)
}

/** A server left behind by a crashed run of ours (same data directory) is shut down; stale files go. */
async function clearStaleServer(dataDir: string, pidFile: string, socket: string): Promise<void> {
  if (existsSync(pidFile)) {
    const pid = Number(readFileSync(pidFile, 'utf8').trim())
    if (Number.isInteger(pid) && pid > 0 && processAlive(pid) && commandLineOf(pid).includes(dataDir)) {
      say(`stopping a MariaDB left running by an earlier run (pid ${pid})`)
      process.kill(pid, 'SIGTERM')
      if (!(await waitForExit(pid, 30_000))) process.kill(pid, 'SIGKILL')
    }
    rmSync(pidFile, { force: true })
  }
  rmSync(socket, { force: true })
  rmSync(`${socket}.lock`, { force: true })
}

async function connectWhenReady(socket: string, child: ChildProcess, logFile: string): Promise<mysql.Connection> {
  const deadline = Date.now() + 60_000
  let lastError: unknown
  while (Date.now() < deadline) {
    if (child.exitCode !== null) {
      const tail = existsSync(logFile) ? readFileSync(logFile, 'utf8').split('\n').slice(-15).join('\n') : ''
      throw new Error(`mariadbd exited with code ${child.exitCode} during start-up:\n${tail}`)
    }
    if (existsSync(socket)) {
      try {
        return await mysql.createConnection({ socketPath: socket, user: 'root', password: '' })
      } catch (error) {
        lastError = error
      }
    }
    await sleep(150)
  }
  throw new Error(`MariaDB did not answer within 60 s: ${String(lastError)}`)
}

/** Initialises (first time) and starts the server, then creates the database and the app's account. */
export async function startMaria(options: MariaOptions): Promise<MariaInstance> {
  ensureMariaInstalled()
  const dir = path.resolve(options.dir)
  const dataDir = path.join(dir, 'data')
  const socket = path.join(dir, 'mysqld.sock')
  const pidFile = path.join(dir, 'mysqld.pid')
  const logFile = path.join(dir, 'mysqld.log')
  mkdirSync(dir, { recursive: true })
  await clearStaleServer(dataDir, pidFile, socket)

  if (!existsSync(path.join(dataDir, 'mysql'))) {
    say(`initialising MariaDB data directory ${path.relative(process.cwd(), dataDir) || dataDir}`)
    const installDb = findExecutable(INSTALL_DB_CANDIDATES)
    if (!installDb) throw new Error('mariadb-install-db not found; install mariadb-server')
    rmSync(dataDir, { recursive: true, force: true })
    const result = spawnSync(
      installDb,
      ['--no-defaults', `--datadir=${dataDir}`, '--user=root', '--auth-root-authentication-method=normal', '--skip-test-db'],
      { encoding: 'utf8' },
    )
    if (result.status !== 0) throw new Error(`mariadb-install-db failed:\n${result.stderr}`)
  }

  const server = findExecutable(SERVER_CANDIDATES)
  if (!server) throw new Error('mariadbd not found; install mariadb-server')
  const log = openSync(logFile, 'a')
  const child = spawn(
    server,
    [
      '--no-defaults',
      `--datadir=${dataDir}`,
      '--user=root',
      '--bind-address=127.0.0.1',
      `--port=${options.port}`,
      `--socket=${socket}`,
      `--pid-file=${pidFile}`,
      '--skip-name-resolve',
      '--character-set-server=utf8mb4',
      '--collation-server=utf8mb4_unicode_ci',
      '--innodb-buffer-pool-size=128M',
      '--max-connections=300',
    ],
    { stdio: ['ignore', log, log], detached: false },
  )
  const pid = child.pid
  if (pid === undefined) throw new Error('could not start mariadbd')

  const connection = await connectWhenReady(socket, child, logFile)
  try {
    const user = mysql.escape(options.user)
    const password = mysql.escape(options.password)
    await connection.query(`CREATE DATABASE IF NOT EXISTS \`${options.database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`)
    await connection.query(`CREATE USER IF NOT EXISTS ${user}@'127.0.0.1' IDENTIFIED BY ${password}`)
    await connection.query(`ALTER USER ${user}@'127.0.0.1' IDENTIFIED BY ${password}`)
    await connection.query(`GRANT ALL PRIVILEGES ON \`${options.database}\`.* TO ${user}@'127.0.0.1'`)
  } finally {
    await connection.end()
  }

  let stopped = false
  const stop = async (): Promise<void> => {
    if (stopped) return
    stopped = true
    if (processAlive(pid)) {
      process.kill(pid, 'SIGTERM')
      if (!(await waitForExit(pid, 60_000))) process.kill(pid, 'SIGKILL')
    }
    rmSync(pidFile, { force: true })
  }
  writeFileSync(path.join(dir, 'port'), String(options.port))
  return { port: options.port, socket, pid, stop }
}

/** Drops and recreates the database (the demo reset). */
export async function recreateDatabase(socket: string, database: string): Promise<void> {
  const connection = await mysql.createConnection({ socketPath: socket, user: 'root', password: '' })
  try {
    await connection.query(`DROP DATABASE IF EXISTS \`${database}\``)
    await connection.query(`CREATE DATABASE \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`)
  } finally {
    await connection.end()
  }
}
