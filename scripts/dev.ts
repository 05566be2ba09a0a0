// `npm run dev`: MariaDB and the fakes as `npm start` runs them, the API under tsx watch on :8081
// and the Vite dev server with hot reload on :5173 (proxying /api to the API).
import path from 'node:path'
import { spawn } from 'node:child_process'
import { startMaria } from './lib/mariadb'
import { fail, say } from './lib/log'
import { localEnvironment } from './lib/environment'
import { ROOT, onShutdown, startFakes } from './lib/services'

const dataDir = path.resolve(process.env.DATA_DIR ?? '.data')
const apiPort = Number(process.env.API_PORT ?? 8081)

async function main(): Promise<void> {
  const ports = { app: apiPort, db: Number(process.env.DB_PORT ?? 3307), smtp: 2525, mailbox: 2580, payments: 12111 }
  const env: NodeJS.ProcessEnv = { ...localEnvironment(dataDir, ports, 'spinwright'), PORT: String(apiPort), PUBLIC_URL: 'http://127.0.0.1:5173' }
  const maria = await startMaria({ dir: path.join(dataDir, 'mariadb'), port: ports.db, database: 'spinwright', user: 'spinwright', password: env.DB_PASSWORD ?? '' })
  const fakes = await startFakes(env)
  const { prepareDatabase } = await import('../server/db/prepare')
  await prepareDatabase(env)
  const bin = (name: string) => path.join(ROOT, 'node_modules', '.bin', name)
  const api = spawn(bin('tsx'), ['watch', '--tsconfig', 'tsconfig.server.json', 'server/main.ts'], { env, stdio: 'inherit' })
  const vite = spawn(bin('vite'), [], { env: { ...env, PORT: '5173', API_PORT: String(apiPort) }, stdio: 'inherit' })
  say('dev: open http://127.0.0.1:5173 (API on :' + apiPort + ')')
  onShutdown(async () => {
    vite.kill('SIGTERM')
    api.kill('SIGTERM')
    await fakes.stop()
    await maria.stop()
  })
}

main().catch((error: unknown) => fail(error instanceof Error ? error.message : String(error)))
