// Shared start-up pieces of `npm start`, `npm run dev` and `npm test`.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process'
import { randomBytes } from 'node:crypto'
import { existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs'
import net from 'node:net'
import path from 'node:path'
import { say } from './log'

export const ROOT = process.cwd()

/** A port that nothing listens on right now, starting from `preferred`. */
export async function freePort(preferred: number): Promise<number> {
  for (let port = preferred; port < preferred + 200; port += 1) {
    const free = await new Promise<boolean>((resolve) => {
      const probe = net.createServer()
      probe.once('error', () => resolve(false))
      probe.listen(port, '127.0.0.1', () => probe.close(() => resolve(true)))
    })
    if (free) return port
  }
  throw new Error(`no free port near ${preferred}`)
}

export function sessionSecret(dataDir: string): string {
  const file = path.join(dataDir, 'session-secret')
  if (existsSync(file)) return readFileSync(file, 'utf8').trim()
  mkdirSync(dataDir, { recursive: true })
  const secret = randomBytes(32).toString('base64url')
  writeFileSync(file, secret, { mode: 0o600 })
  return secret
}

function newestMtime(entry: string): number {
  if (!existsSync(entry)) return 0
  const stat = statSync(entry)
  if (!stat.isDirectory()) return stat.mtimeMs
  let newest = stat.mtimeMs
  for (const child of readdirSync(entry)) newest = Math.max(newest, newestMtime(path.join(entry, child)))
  return newest
}

/** Builds the SPA with Vite into `outDir` (default dist/) when it is missing or older than its sources. */
export function buildClientIfStale(outDir = path.join(ROOT, 'dist')): void {
  const built = newestMtime(path.join(outDir, 'index.html'))
  const sources = Math.max(
    ...['src', 'shared', 'public', 'index.html', 'vite.config.ts', 'package-lock.json'].map((entry) => newestMtime(path.join(ROOT, entry))),
  )
  if (built > sources) return
  say('building the client (vite build) ...')
  const result = spawnSync(path.join(ROOT, 'node_modules', '.bin', 'vite'), ['build', '--logLevel', 'warn', '--outDir', outDir, '--emptyOutDir'], { stdio: 'inherit' })
  if (result.status !== 0) throw new Error('vite build failed')
}

export interface FakeServices {
  process: ChildProcess
  stop(): Promise<void>
}

/** Starts the local fake SMTP server and fake payment API in a child process; resolves when ready. */
export async function startFakes(env: NodeJS.ProcessEnv): Promise<FakeServices> {
  const child = spawn(path.join(ROOT, 'node_modules', '.bin', 'tsx'), ['--tsconfig', 'tsconfig.server.json', 'server/fakes/main.ts'], {
    env,
    stdio: ['ignore', 'pipe', 'inherit'],
  })
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error('local fakes did not start within 30 s')), 30_000)
    child.once('exit', (code) => reject(new Error(`local fakes exited with code ${code}`)))
    child.stdout?.on('data', (chunk: Buffer) => {
      const text = chunk.toString()
      if (process.env.SPINWRIGHT_VERBOSE) process.stdout.write(text)
      if (text.includes('fakes ready')) {
        clearTimeout(timer)
        resolve()
      }
    })
  })
  return {
    process: child,
    stop: async () => {
      if (child.exitCode !== null) return
      child.kill('SIGTERM')
      await new Promise<void>((resolve) => {
        const timer = setTimeout(() => {
          child.kill('SIGKILL')
          resolve()
        }, 10_000)
        child.once('exit', () => {
          clearTimeout(timer)
          resolve()
        })
      })
    },
  }
}

/** Runs `stop` once on SIGINT/SIGTERM, then exits. */
export function onShutdown(stop: () => Promise<void>): void {
  let stopping = false
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.on(signal, () => {
      if (stopping) return
      stopping = true
      say(`stopping (${signal}) ...`)
      stop()
        .then(() => process.exit(0))
        .catch((error: unknown) => {
          console.error(error)
          process.exit(1)
        })
    })
  }
}
