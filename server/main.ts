// `tsx server/main.ts`: serves API and SPA with the environment's settings (used by dev and e2e runs).
import { startServer } from './index'

const running = await startServer()
console.log(`[spinwright] API listening on ${running.url}`)
let stopping = false
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    if (stopping) return
    stopping = true
    running
      .stop()
      .then(() => process.exit(0))
      .catch(() => process.exit(1))
  })
}
