#!/usr/bin/env node
// Entry point of `npm start`, `npm test` and `npm run dev`: it must run on a fresh clone before any
// dependency exists, so it is plain Node. It installs the locked dependencies when they are missing
// or stale, then hands over to the TypeScript script for the command.
import { spawn, spawnSync } from 'node:child_process'
import { existsSync, statSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import path from 'node:path'

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..')
const command = process.argv[2]
const scripts = { start: 'scripts/start.ts', test: 'scripts/test.ts', dev: 'scripts/dev.ts' }

if (!command || !(command in scripts)) {
  console.error(`usage: node scripts/bootstrap.mjs ${Object.keys(scripts).join('|')}`)
  process.exit(2)
}

function dependenciesStale() {
  const marker = path.join(root, 'node_modules', '.package-lock.json')
  if (!existsSync(marker)) return true
  return statSync(path.join(root, 'package-lock.json')).mtimeMs > statSync(marker).mtimeMs + 1000
}

if (dependenciesStale()) {
  console.log('[spinwright] installing locked dependencies (npm ci) ...')
  const result = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root, stdio: 'inherit' })
  if (result.status !== 0) {
    console.error('[spinwright] npm ci failed; see the messages above')
    process.exit(result.status ?? 1)
  }
}

// A larger young generation for the app (V8's default semi-space is 16 MB): a duty study over a
// big catalogue makes some 8 MB of short-lived points per run, and with the default most runs
// met a scavenge mid-run that copied, then promoted, their live points, and the old generation
// (the prepared catalogue) paid for them in full collections. Children (the app under `npm test`)
// inherit it. The same flag is in package.json's bench script; docs/performance.md has the figures.
const APP_NODE_OPTIONS = '--max-semi-space-size=64'
const env = { ...process.env, NODE_OPTIONS: [process.env.NODE_OPTIONS, APP_NODE_OPTIONS].filter(Boolean).join(' ') }

const tsx = path.join(root, 'node_modules', '.bin', 'tsx')
const child = spawn(tsx, ['--tsconfig', 'tsconfig.server.json', scripts[command], ...process.argv.slice(3)], { cwd: root, stdio: 'inherit', env })
for (const signal of ['SIGINT', 'SIGTERM']) {
  process.on(signal, () => child.kill(signal))
}
child.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)))
